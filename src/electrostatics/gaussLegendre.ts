// 5-point Gauss–Legendre rule on [-1, 1] (Abramowitz & Stegun, Handbook of Mathematical Functions, Table 25.4):
// int_-1^1 f(t) dt ~= sum_k w_k f(t_k), exact for polynomials up to degree 9. Shared by the far-end first integral
// (poisson.ts) and the exchange integrals (src/derived/exchange.ts).
export const GL5_NODES: readonly number[] = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
export const GL5_WEIGHTS: readonly number[] = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];
