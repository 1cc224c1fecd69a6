// @ts-check
// Fixed local ports and folders: one set each for `npm start`, `npm test` and `npm run bench`, so
// they can run at once.
// GLOAMING_PORT_OFFSET shifts every port, for a second checkout running its own stack beside this one.
const offset = Number(process.env.GLOAMING_PORT_OFFSET ?? 0);

/** @param {{ appPort: number, pgPort: number, smtpPort: number, mailWebPort: number, s3Port: number, mqttPort: number, pgDir: string, s3Dir: string, mqttDir: string }} set */
function shifted(set) {
	return {
		...set,
		appPort: set.appPort + offset,
		pgPort: set.pgPort + offset,
		smtpPort: set.smtpPort + offset,
		mailWebPort: set.mailWebPort + offset,
		s3Port: set.s3Port + offset,
		mqttPort: set.mqttPort + offset
	};
}

export const LOCAL = {
	dev: shifted({
		appPort: 5510,
		pgPort: 5532,
		smtpPort: 2525,
		mailWebPort: 5525,
		s3Port: 5530,
		mqttPort: 5583,
		pgDir: '.data/pg-dev',
		s3Dir: '.data/objects-dev',
		mqttDir: '.data/mqtt-dev'
	}),
	test: shifted({
		appPort: 5610,
		pgPort: 5632,
		smtpPort: 2625,
		mailWebPort: 5625,
		s3Port: 5630,
		mqttPort: 5683,
		pgDir: '.data/pg-test',
		s3Dir: '.data/objects-test',
		mqttDir: '.data/mqtt-test'
	}),
	bench: shifted({
		appPort: 5710,
		pgPort: 5732,
		smtpPort: 2725,
		mailWebPort: 5725,
		s3Port: 5730,
		mqttPort: 5783,
		pgDir: '.data/pg-bench',
		s3Dir: '.data/objects-bench',
		mqttDir: '.data/mqtt-bench'
	})
};
