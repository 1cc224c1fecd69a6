// The parts of jStat the tests use as a reference; the package ships no types.
declare module 'jstat' {
	const jStat: {
		studentt: { inv(p: number, dof: number): number; cdf(x: number, dof: number): number };
	};
	export default jStat;
}
