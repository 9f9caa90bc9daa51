/**
 * atan2, tan, sin and cos evaluated by their Taylor series where the argument is small,
 * which is where almost every call of the trial loop lands (misalignment angles, heading
 * errors of a degree or two). These are not small-angle approximations: the series are
 * cut where the remainder falls below 1e-18 of the value, so the results agree with
 * Math.* to rounding (tests/engine/fastmath.test.ts holds them to it). Outside the small
 * range they call Math.* directly.
 */

/** |t| <= 1/8: the atan series to t^17 leaves a remainder below 2e-18 relative. */
const ATAN_LIMIT = 0.125;

/** atan2(y, x), through the series when x > 0 and |y| <= x/8 (within 7.1 deg of the x axis). */
export function atan2Fast(y: number, x: number): number {
  if (x > 0) {
    const ay = y < 0 ? -y : y;
    if (ay <= 0.03125 * x) {
      // |t| <= 1/32: to t^11 the remainder is below 1e-19 relative
      const t = y / x;
      const t2 = t * t;
      return t * (1 + t2 * (-1 / 3 + t2 * (1 / 5 + t2 * (-1 / 7 + t2 * (1 / 9 + t2 * (-1 / 11 + t2 * (1 / 13)))))));
    }
    if (ay <= ATAN_LIMIT * x) {
      const t = y / x;
      const t2 = t * t;
      // t − t³/3 + t⁵/5 − … − t¹⁵/15 + t¹⁷/17
      return (
        t *
        (1 + t2 * (-1 / 3 + t2 * (1 / 5 + t2 * (-1 / 7 + t2 * (1 / 9 + t2 * (-1 / 11 + t2 * (1 / 13 + t2 * (-1 / 15 + t2 * (1 / 17)))))))))
      );
    }
  }
  return Math.atan2(y, x);
}

/** tan(a) for |a| <= 0.1 rad by its series to a^17 (remainder < 1e-20 relative). */
export function tanFast(a: number): number {
  if (a > 0.1 || a < -0.1) return Math.tan(a);
  const a2 = a * a;
  return (
    a *
    (1 +
      a2 *
        (1 / 3 +
          a2 *
            (2 / 15 +
              a2 *
                (17 / 315 +
                  a2 *
                    (62 / 2835 +
                      a2 * (1382 / 155925 + a2 * (21844 / 6081075 + a2 * (929569 / 638512875 + a2 * (6404582 / 10854718875)))))))))
  );
}

/** sin and cos of a small angle (|a| <= 1/8) by their series to a^17 and a^18. */
export function sinFast(a: number): number {
  if (a > 0.125 || a < -0.125) return Math.sin(a);
  const a2 = a * a;
  return (
    a *
    (1 -
      (a2 / 6) *
        (1 - (a2 / 20) * (1 - (a2 / 42) * (1 - (a2 / 72) * (1 - (a2 / 110) * (1 - (a2 / 156) * (1 - (a2 / 210) * (1 - a2 / 272))))))))
  );
}

export function cosFast(a: number): number {
  if (a > 0.125 || a < -0.125) return Math.cos(a);
  const a2 = a * a;
  return (
    1 -
    (a2 / 2) *
      (1 -
        (a2 / 12) *
          (1 - (a2 / 30) * (1 - (a2 / 56) * (1 - (a2 / 90) * (1 - (a2 / 132) * (1 - (a2 / 182) * (1 - (a2 / 240) * (1 - a2 / 306))))))))
  );
}

/*
 * Out-parameter forms for the trial loop: a double returned from a call the compiler does
 * not inline is boxed on the heap; written into a Float64Array it is not.
 */

/** out[i] = atan2Fast(y, x) */
export function atan2To(y: number, x: number, out: Float64Array, i: number): void {
  if (x > 0) {
    const ay = y < 0 ? -y : y;
    if (ay <= ATAN_LIMIT * x) {
      const t = y / x;
      const t2 = t * t;
      out[i] =
        t *
        (1 + t2 * (-1 / 3 + t2 * (1 / 5 + t2 * (-1 / 7 + t2 * (1 / 9 + t2 * (-1 / 11 + t2 * (1 / 13 + t2 * (-1 / 15 + t2 * (1 / 17)))))))));
      return;
    }
  }
  out[i] = Math.atan2(y, x);
}

/** out[i + k] = tanFast(a[aOff + k]·scale) for k = 0..n−1 */
export function tanTo(a: Float64Array, aOff: number, scale: number, n: number, out: Float64Array, i: number): void {
  for (let k = 0; k < n; k++) {
    const x = a[aOff + k] * scale;
    if (x > 0.1 || x < -0.1) {
      out[i + k] = Math.tan(x);
      continue;
    }
    const x2 = x * x;
    out[i + k] =
      x *
      (1 +
        x2 *
          (1 / 3 +
            x2 *
              (2 / 15 +
                x2 *
                  (17 / 315 +
                    x2 *
                      (62 / 2835 +
                        x2 * (1382 / 155925 + x2 * (21844 / 6081075 + x2 * (929569 / 638512875 + x2 * (6404582 / 10854718875)))))))));
  }
}

/**
 * out[i] = sinFast(x), out[i + 1] = cosFast(x) for x = src[srcOff]·scale. The angle is read
 * from an array, as in tanTo: where V8 does not inline this call, a number argument would be
 * passed boxed (a heap allocation per call).
 */
export function sinCosTo(src: Float64Array, srcOff: number, scale: number, out: Float64Array, i: number): void {
  const a = src[srcOff] * scale;
  if (a > 0.125 || a < -0.125) {
    out[i] = Math.sin(a);
    out[i + 1] = Math.cos(a);
    return;
  }
  const a2 = a * a;
  out[i] =
    a *
    (1 -
      (a2 / 6) *
        (1 - (a2 / 20) * (1 - (a2 / 42) * (1 - (a2 / 72) * (1 - (a2 / 110) * (1 - (a2 / 156) * (1 - (a2 / 210) * (1 - a2 / 272))))))));
  out[i + 1] =
    1 -
    (a2 / 2) *
      (1 -
        (a2 / 12) *
          (1 - (a2 / 30) * (1 - (a2 / 56) * (1 - (a2 / 90) * (1 - (a2 / 132) * (1 - (a2 / 182) * (1 - (a2 / 240) * (1 - a2 / 306))))))));
}
