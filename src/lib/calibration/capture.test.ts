import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { readCapture } from './capture';

function lines(...rows: string[]): string {
	return rows.join('\n') + '\n';
}

describe('readCapture', () => {
	it('reads a headed capture with aliases and mixed-case labels', async () => {
		const text = lines('Time,Value,Label', '0.0,1000,IDLE', '0.5,1002,idle', '1.0,1100,Present');
		const result = await readCapture([text]);
		// design item 2: header optional, value accepted for reading, labels in any case
		expect(result.ok).toBe(true);
		expect(result.columns).toEqual({ header: true, time: true });
		// arithmetic on the rows above: idle 1000 and 1002, present 1100
		expect(result.summary.idle).toMatchObject({ count: 2, mean: 1001, min: 1000, max: 1002 });
		expect(result.summary.present).toMatchObject({ count: 1, mean: 1100 });
		// 2 idle points on a line rising 2 per 0.5 s = 240 per minute
		expect(result.summary.driftPerMinute).toBeCloseTo(240, 10);
	});

	it('reads headerless captures of 2 and 3 columns', async () => {
		// design item 2: without a header, 2 columns are reading,label and 3 are time,reading,label
		const two = await readCapture([lines('10,idle', '12,idle', '30,present')]);
		expect(two.columns).toEqual({ header: false, time: false });
		expect(two.summary.idle.mean).toBe(11);
		const three = await readCapture([lines('0,10,idle', '1,12,idle', '2,30,present')]);
		expect(three.columns).toEqual({ header: false, time: true });
		// 2 readings per 2 seconds: (3 rows - 1) / 2 s = 1 Hz
		expect(three.summary.measuredRateHz).toBe(1);
	});

	it('takes milliseconds and ISO 8601 times', async () => {
		const ms = await readCapture([
			lines('time_ms,reading,label', '0,10,idle', '500,11,idle', '1000,50,present')
		]);
		// 2 rows per second from 500 ms spacing: (3 - 1) / 1 s
		expect(ms.summary.measuredRateHz).toBe(2);
		const iso = await readCapture([
			lines(
				'timestamp,reading,label',
				'2025-10-31T19:00:00Z,10,idle',
				'2025-10-31T19:01:00Z,13,idle',
				'2025-10-31T19:02:00Z,50,present'
			)
		]);
		// ISO 8601 date-times one minute apart; idle rises 3 in that minute
		expect(iso.summary.driftPerMinute).toBeCloseTo(3, 10);
	});

	it('handles CRLF, a byte order mark, blank lines, comments and quoted fields', async () => {
		// RFC 4180 §2: CRLF line ends and quoted fields; Unicode §23.8 (memory): a leading BOM is not content
		const text =
			'\ufeffreading,label\r\n# bench test\r\n\r\n"1,5",idle\r\n5,"present"\r\n7,idle\r\n';
		const result = await readCapture([text]);
		expect(result.errors).toEqual([
			// counted by hand: header 1, comment 2, blank 3, bad quoted reading on line 4
			{ line: 4, message: "line 4: reading '1,5' is not a number" }
		]);
		// the rows left: 5 present and 7 idle
		expect(result.summary.idle.count).toBe(1);
	});

	it('reports bad lines with their line numbers', async () => {
		const rows = ['time,reading,label'];
		for (let i = 2; i <= 25; i++)
			rows.push(`${i},${1000 + (i % 3)},${i % 5 === 0 ? 'present' : 'idle'}`);
		rows[13] = '14,abc,idle';
		rows[19] = '20,1001,mayb';
		rows[21] = '22,1001';
		rows[22] = ',1001,idle';
		const result = await readCapture([lines(...rows)]);
		expect(result.ok).toBe(false);
		// line numbers counted by hand from the rows built above (header is line 1)
		expect(result.errors.map((e) => e.message)).toEqual([
			"line 14: reading 'abc' is not a number",
			"line 20: label 'mayb' must be idle or present",
			'line 22: expected 3 columns, found 2',
			'line 23: time is empty'
		]);
		expect(result.errors.map((e) => e.line)).toEqual([14, 20, 22, 23]);
		// 4 errors are under the limit of 20, so all 24 data lines were read and 20 were good
		expect(result.stoppedEarly).toBe(false);
		expect(result.summary.rows).toBe(20);
	});

	it('stops after the first 20 errors and reports them all', async () => {
		const rows = ['reading,label', '1,idle', '9,present'];
		for (let i = 0; i < 50; i++) rows.push(`x${i},idle`);
		const result = await readCapture([lines(...rows)]);
		// design item 2: stop at the first 20 errors and report them all
		expect(result.errors).toHaveLength(20);
		expect(result.stoppedEarly).toBe(true);
		// the bad rows start on line 4, so the 20th is line 23
		expect(result.errors[0].message).toBe("line 4: reading 'x0' is not a number");
		expect(result.errors[19].message).toBe("line 23: reading 'x19' is not a number");
	});

	it('treats a capture without one of the labels as an error', async () => {
		const result = await readCapture([lines('reading,label', '1,idle', '2,idle')]);
		// design item 2: a file with zero idle or zero present rows is an error
		expect(result.ok).toBe(false);
		expect(result.errors).toEqual([{ line: null, message: 'the capture has no present readings' }]);
		const empty = await readCapture(['']);
		expect(empty.errors).toEqual([{ line: null, message: 'the capture is empty' }]);
	});

	it('stops at a header without the needed columns', async () => {
		const result = await readCapture([lines('time,value,note', '1,2,x')]);
		// design item 2: a header names its columns; without a label column nothing can be read
		expect(result.errors).toEqual([
			{ line: 1, message: 'line 1: header has no label column (label or state)' }
		]);
		expect(result.stoppedEarly).toBe(true);
	});

	it('stops at a quote that never closes, naming its line', async () => {
		// RFC 4180 §2.5–2.7: a quoted field must be closed by a double quote
		const result = await readCapture([
			lines('reading,label', '1,idle', '2,present', '3,"idle', '4,idle')
		]);
		expect(result.errors).toHaveLength(1);
		// counted by hand: the quote opens on line 4
		expect(result.errors[0].message).toBe(
			'line 4: a quote opened on or after this line is never closed; reading stopped here'
		);
		expect(result.stoppedEarly).toBe(true);
	});

	it('keeps a huge line from being held in memory', async () => {
		const result = await readCapture([
			lines('reading,label', '1,idle', 'x'.repeat(10000), '2,present')
		]);
		// counted by hand: the long line is line 3; 4096 characters is our own limit
		expect(result.errors[0].line).toBe(3);
		expect(result.errors[0].message).toContain('longer than 4096 characters');
	});

	it('streams a generated 200,000-row capture', async () => {
		// generated in pieces, never as one string: 200 blocks of 900 idle then 100 present rows at 50 Hz,
		// idle on the known line 1000 + 0.01 * t with +-1 alternating noise, present 1100 +- 5
		const rowsTotal = 200000;
		async function* generate() {
			let chunk = 'time,reading,label\n';
			for (let i = 0; i < rowsTotal; i++) {
				const t = i * 0.02;
				const present = i % 1000 >= 900;
				const noise = i % 2 === 0 ? 1 : -1;
				const reading = present ? 1100 + 5 * noise : 1000 + 0.01 * t + noise;
				chunk += `${t.toFixed(2)},${reading.toFixed(4)},${present ? 'present' : 'idle'}\n`;
				if (chunk.length > 64 * 1024) {
					yield chunk;
					chunk = '';
				}
			}
			yield chunk;
		}
		let seen = 0;
		const result = await readCapture(Readable.from(generate()), {
			sampleSize: 2048,
			onRow: () => {
				seen++;
			}
		});
		// counted from the generator: every row good, 200 blocks x 900 idle and x 100 present
		expect(result.ok).toBe(true);
		expect(seen).toBe(rowsTotal);
		const { summary } = result;
		expect([summary.rows, summary.idle.count, summary.present.count]).toEqual([
			200000, 180000, 20000
		]);
		// present rows alternate 1105 and 1095 in equal numbers: mean 1100, sample sigma 5 * sqrt(n/(n-1))
		expect(summary.present.mean).toBeCloseTo(1100, 9);
		expect(summary.present.sigma).toBeCloseTo(5 * Math.sqrt(20000 / 19999), 9);
		// least squares on a known line: 0.01 per second = 0.6 per minute
		expect(summary.driftPerMinute).toBeCloseTo(0.6, 5);
		// 199,999 intervals of 0.02 s: 50 Hz
		expect(summary.measuredRateHz).toBeCloseTo(50, 9);
		// bounded memory: the kept sample never grows past its size
		expect(summary.idle.sample).toHaveLength(2048);
		expect(summary.present.sample).toHaveLength(2048);
		// worked from the generator: present readings are exactly 1100 - 5 and 1100 + 5
		expect(summary.present.min).toBe(1095);
		expect(summary.present.max).toBe(1105);
	}, 30000);
});
