// @ts-check
// Fixed local ports and folders: one set for `npm start`, one for `npm test`, so both can run at once.
export const LOCAL = {
	dev: {
		appPort: 5510,
		pgPort: 5532,
		smtpPort: 2525,
		mailWebPort: 5525,
		s3Port: 5530,
		pgDir: '.data/pg-dev',
		s3Dir: '.data/objects-dev'
	},
	test: {
		appPort: 5610,
		pgPort: 5632,
		smtpPort: 2625,
		mailWebPort: 5625,
		s3Port: 5630,
		pgDir: '.data/pg-test',
		s3Dir: '.data/objects-test'
	}
};
