/**
 * Points in the first call of a kernel that carries its running sums in a small state array and is
 * called twice, over its first points and then over the rest (DEVELOPERS.md, "Long loops and the
 * first call"): V8 gives a function its type-feedback store only after it has run bytecode worth about
 * 8 times its own size, so the short first call must run long enough for that, and then the code after
 * its loop (the saving of the sums) has run and been recorded before the long call compiles the loop.
 * 64 points is above that budget for every such kernel here (at most about 30 iterations of the
 * largest, the one-pass dual of order 3), and costs nothing measurable.
 */
export const FIRST_CALL_POINTS = 64;
