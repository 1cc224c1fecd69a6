/* eslint-disable no-loss-of-precision -- the published coefficients are kept digit for digit as printed */
// W. J. Cody, "Rational Chebyshev approximations for the error function", Math. Comp. 23 (1969):
// three rational approximations, |x| <= 0.46875, 0.46875 < |x| <= 4 and |x| > 4, each accurate
// to about double precision.
const A = [
	3.1611237438705656, 1.13864154151050156e2, 3.77485237685302021e2, 3.20937758913846947e3,
	1.85777706184603153e-1
];
const B = [
	2.36012909523441209e1, 2.44024637934444173e2, 1.28261652607737228e3, 2.84423683343917062e3
];
const C = [
	5.64188496988670089e-1, 8.88314979438837594, 6.61191906371416295e1, 2.98635138197400131e2,
	8.8195222124176909e2, 1.71204761263407058e3, 2.05107837782607147e3, 1.23033935479799725e3,
	2.15311535474403846e-8
];
const D = [
	1.57449261107098347e1, 1.17693950891312499e2, 5.37181101862009858e2, 1.62138957456669019e3,
	3.29079923573345963e3, 4.36261909014324716e3, 3.43936767414372164e3, 1.23033935480374942e3
];
const P = [
	3.05326634961232344e-1, 3.60344899949804439e-1, 1.25781726111229246e-1, 1.60837851487422766e-2,
	6.58749161529837803e-4, 1.63153871373020978e-2
];
const Q = [
	2.56852019228982242, 1.87295284992346047, 5.27905102951428412e-1, 6.05183413124413191e-2,
	2.33520497626869185e-3
];
const ONE_OVER_SQRT_PI = 0.56418958354775628695;

// exp(-y*y) computed as exp(-r*r) * exp(-(y-r)(y+r)) with r = y rounded down to 1/16, so the
// square does not lose digits for large y.
function expMinusSquare(y: number): number {
	const r = Math.trunc(y * 16) / 16;
	return Math.exp(-r * r) * Math.exp(-(y - r) * (y + r));
}

/** Complementary error function erfc(x) = 1 - erf(x), by Cody's rational approximations. */
export function erfc(x: number): number {
	if (Number.isNaN(x)) return NaN;
	const y = Math.abs(x);
	let result: number;
	if (y <= 0.46875) {
		const ysq = y * y;
		let num = A[4] * ysq;
		let den = ysq;
		for (let i = 0; i < 3; i++) {
			num = (num + A[i]) * ysq;
			den = (den + B[i]) * ysq;
		}
		return 1 - (x * (num + A[3])) / (den + B[3]);
	} else if (y <= 4) {
		let num = C[8] * y;
		let den = y;
		for (let i = 0; i < 7; i++) {
			num = (num + C[i]) * y;
			den = (den + D[i]) * y;
		}
		result = ((num + C[7]) / (den + D[7])) * expMinusSquare(y);
	} else if (y >= 26.543) {
		// erfc underflows to zero in double precision beyond here.
		result = 0;
	} else {
		const ysq = 1 / (y * y);
		let num = P[5] * ysq;
		let den = ysq;
		for (let i = 0; i < 4; i++) {
			num = (num + P[i]) * ysq;
			den = (den + Q[i]) * ysq;
		}
		result = (ysq * (num + P[4])) / (den + Q[4]);
		result = ((ONE_OVER_SQRT_PI - result) / y) * expMinusSquare(y);
	}
	return x < 0 ? 2 - result : result;
}

export function erf(x: number): number {
	return 1 - erfc(x);
}

/** Standard normal upper tail P(Z > z) = erfc(z / sqrt 2) / 2. */
export function normalUpperTail(z: number): number {
	if (z === Infinity) return 0;
	if (z === -Infinity) return 1;
	return erfc(z / Math.SQRT2) / 2;
}
