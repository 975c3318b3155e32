/**
 * Root of f in [a, b] given f(a) and f(b) of opposite sign (or one zero):
 * Illinois-modified regula falsi, which keeps the bracket (so it cannot wander
 * off the table) and converges fast on the near-exponential curves of a table.
 * Like SciPy's brentq(f, a, b): f must change sign on [a, b]; returns x with
 * |b − a| shrunk to rounding or f(x) = 0; never evaluates f outside [a, b].
 */
export function solveBracket(f: (x: number) => number, a: number, b: number, fa: number, fb: number): number {
  if (fa === 0) return a;
  if (fb === 0) return b;
  let side = 0;
  for (let k = 0; k < 200; k++) {
    let x = (a * fb - b * fa) / (fb - fa);
    if (!(x > Math.min(a, b) && x < Math.max(a, b))) x = 0.5 * (a + b);
    const fx = f(x);
    if (fx === 0 || Math.abs(b - a) <= 1e-15 * (1 + Math.abs(x))) return x;
    if ((fx > 0) === (fb > 0)) {
      b = x;
      fb = fx;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = x;
      fa = fx;
      if (side === 1) fb /= 2;
      side = 1;
    }
    if (Math.abs(fx) < 1e-15) return x;
  }
  return 0.5 * (a + b);
}
