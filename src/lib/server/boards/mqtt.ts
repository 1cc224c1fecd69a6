import mqtt, { type MqttClient } from 'mqtt';
import type { Db } from '$lib/server/db/client';
import { acceptMessage, type Accepted } from './accept';

// The app's subscription to the broker. Boards publish to gloaming/<controller id>/readings with
// their key inside the message; the broker lets anyone publish, so every message is checked here
// and a refusal is logged (a board cannot be answered over MQTT).

export const TOPIC = 'gloaming/+/readings';
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export interface Listener {
	client: MqttClient;
	stop(): Promise<void>;
}

export async function startBoardListener(
	db: Db,
	url: string,
	{
		log = (line: string) => console.warn(line),
		onResult
	}: { log?: (line: string) => void; onResult?: (topic: string, result: Accepted) => void } = {}
): Promise<Listener> {
	const client = await mqtt.connectAsync(url, {
		clientId: `gloaming-app-${process.pid}-${Math.random().toString(16).slice(2, 8)}`,
		reconnectPeriod: 2000,
		clean: true
	});
	client.on('error', (e) => log(`[boards] broker: ${e.message}`));
	client.on('message', (topic, payload) => {
		const controllerId = topic.split('/')[1] ?? '';
		const handle = async (): Promise<Accepted> => {
			if (!UUID.test(controllerId))
				return { ok: false, status: 400, message: 'The topic does not name a controller id.' };
			return acceptMessage(db, {
				token: null,
				text: payload.toString('utf8'),
				controllerId: controllerId.toLowerCase()
			});
		};
		handle()
			.catch((e: unknown): Accepted => {
				log(`[boards] ${topic}: could not store: ${e instanceof Error ? e.message : e}`);
				return { ok: false, status: 422, message: 'Could not be stored.' };
			})
			.then((result) => {
				if (!result.ok) log(`[boards] refused a message on ${topic}: ${result.message}`);
				onResult?.(topic, result);
			});
	});
	await client.subscribeAsync(TOPIC, { qos: 1 });
	return {
		client,
		stop: async () => {
			await client.endAsync();
		}
	};
}
