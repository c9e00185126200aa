// Temperature scaling (Guo, Pleiss, Sun & Weinberger, "On Calibration of Modern Neural
// Networks", ICML 2017, §4.2): divide every logit row by one T > 0 chosen to minimize the
// mean negative log-likelihood of the gold labels on held-out data. T changes confidence,
// never the arg-max, so accuracy is untouched.
//
// With β = 1/T the objective NLL(β) = mean_i [logsumexp(β·z_i) − β·z_i,gold] is convex
// (log-sum-exp of functions linear in β), hence unimodal in log T too. So: golden-section
// search over log T in [log 0.05, log 20] (robust, needs no derivative), then a few Newton
// steps in β, whose derivatives are closed-form:
//   dNLL/dβ   = mean_i (E_p[z_i] − z_i,gold)
//   d²NLL/dβ² = mean_i Var_p[z_i]            (p = softmax(β·z_i))
// The answer is clamped to [0.05, 20]: an optimum outside means the data asks for an
// extreme (all correct → T → 0; pure noise → T → ∞), and a bound is the honest answer.

import { TEMPERATURE_MAX, TEMPERATURE_MIN } from "../../runtime/format/header-limits.ts";
import { checkInteger, checkLabelIndex } from "./input-checks.ts";
import { metricsInputError } from "./metrics-input-error.ts";

/** Search range for the temperature: the range a model file may hold (the loader refuses others). */
export { TEMPERATURE_MIN, TEMPERATURE_MAX } from "../../runtime/format/header-limits.ts";

/** Result of `fitTemperature`: the temperature and mean NLL at T = 1 and at T. */
export interface TemperatureFit {
  temperature: number;
  nllBefore: number;
  nllAfter: number;
}

const GOLDEN_SECTION_STEPS = 100; // 0.618^100 ≈ 1e-21 of the log-range: far below double precision
const NEWTON_STEPS = 4;

type Logits = Float32Array | Float64Array;
type GoldLabels = Int32Array | ArrayLike<number>;

// Mean NLL at inverse temperature β; the golden-section search calls only this.
function meanNll(logits: Logits, gold: GoldLabels, n: number, k: number, beta: number): number {
  let nll = 0;
  for (let i = 0; i < n; i++) {
    const row = i * k;
    let max = -Infinity;
    for (let j = 0; j < k; j++) max = Math.max(max, beta * logits[row + j]);
    let sumExp = 0;
    for (let j = 0; j < k; j++) sumExp += Math.exp(beta * logits[row + j] - max);
    nll += max + Math.log(sumExp) - beta * logits[row + gold[i]];
  }
  return nll / n;
}

// Mean NLL with its first and second derivatives in β, for the Newton polish. The variance is
// taken about the mean in a second pass, so large logits do not cancel it away.
function nllWithDerivatives(
  logits: Logits,
  gold: GoldLabels,
  n: number,
  k: number,
  beta: number,
): { nll: number; gradient: number; curvature: number } {
  let nll = 0;
  let gradient = 0;
  let curvature = 0;
  for (let i = 0; i < n; i++) {
    const row = i * k;
    let max = -Infinity;
    for (let j = 0; j < k; j++) max = Math.max(max, beta * logits[row + j]);
    let sumExp = 0;
    let sumExpZ = 0;
    for (let j = 0; j < k; j++) {
      const z = logits[row + j];
      const e = Math.exp(beta * z - max);
      sumExp += e;
      sumExpZ += e * z;
    }
    const meanZ = sumExpZ / sumExp;
    let sumExpSquaredDeviation = 0;
    for (let j = 0; j < k; j++) {
      const deviation = logits[row + j] - meanZ;
      sumExpSquaredDeviation += Math.exp(beta * logits[row + j] - max) * deviation * deviation;
    }
    const goldLogit = logits[row + gold[i]];
    nll += max + Math.log(sumExp) - beta * goldLogit;
    gradient += meanZ - goldLogit;
    curvature += sumExpSquaredDeviation / sumExp;
  }
  return { nll: nll / n, gradient: gradient / n, curvature: curvature / n };
}

/**
 * The temperature T in [0.05, 20] minimizing the mean NLL of softmax(logits / T) for the gold
 * labels; `logits` is row-major n × k. Returns T and the mean NLL at T = 1 and at T.
 * @example
 * // three rows of logits [1, 0], gold labels 0, 0, 1
 * fitTemperature(new Float32Array([1, 0, 1, 0, 1, 0]), new Int32Array([0, 0, 1]), 3, 2).temperature // ≈ 1 / ln 2
 */
export function fitTemperature(
  logits: Logits,
  gold: GoldLabels,
  n: number,
  k: number,
): TemperatureFit {
  const fn = "fitTemperature";
  checkInteger(fn, "n", n, 1);
  checkInteger(fn, "k", k, 2);
  if (logits.length !== n * k) {
    throw metricsInputError("length-mismatch", fn, `logits has ${logits.length} values, expected n × k = ${n * k}`);
  }
  if (gold.length !== n) {
    throw metricsInputError("length-mismatch", fn, `gold has ${gold.length} entries, expected n = ${n}`);
  }
  for (let i = 0; i < logits.length; i++) {
    if (!Number.isFinite(logits[i])) {
      throw metricsInputError(
        "bad-number",
        fn,
        `logits[${i}] (row ${Math.floor(i / k)}, label ${i % k}) = ${logits[i]}, expected a finite number`,
      );
    }
  }
  for (let i = 0; i < n; i++) checkLabelIndex(fn, `gold[${i}]`, gold[i], k);

  const nllAtLogTemperature = (logT: number) => meanNll(logits, gold, n, k, Math.exp(-logT));

  // Golden-section search over u = log T, keeping the bracket [low, high].
  const ratio = (Math.sqrt(5) - 1) / 2;
  let low = Math.log(TEMPERATURE_MIN);
  let high = Math.log(TEMPERATURE_MAX);
  let left = high - ratio * (high - low);
  let right = low + ratio * (high - low);
  let nllLeft = nllAtLogTemperature(left);
  let nllRight = nllAtLogTemperature(right);
  for (let step = 0; step < GOLDEN_SECTION_STEPS; step++) {
    if (nllLeft <= nllRight) {
      high = right;
      right = left;
      nllRight = nllLeft;
      left = high - ratio * (high - low);
      nllLeft = nllAtLogTemperature(left);
    } else {
      low = left;
      left = right;
      nllLeft = nllRight;
      right = low + ratio * (high - low);
      nllRight = nllAtLogTemperature(right);
    }
  }
  let beta = Math.exp(-(low + high) / 2);
  let best = nllWithDerivatives(logits, gold, n, k, beta);

  // Golden section pins the argument only to about √ε because the minimum is flat; Newton in β
  // (convex there) finishes the job. A step is kept only if it stays in range, shrinks the
  // gradient and does not raise NLL beyond rounding (near the optimum NLL changes by less
  // than its last bits, so an exact "no increase" test would reject good steps).
  for (let step = 0; step < NEWTON_STEPS && best.curvature > 0; step++) {
    const candidate = beta - best.gradient / best.curvature;
    if (!(candidate >= 1 / TEMPERATURE_MAX && candidate <= 1 / TEMPERATURE_MIN)) break;
    const next = nllWithDerivatives(logits, gold, n, k, candidate);
    const roundingSlack = 1e-12 * Math.max(1, Math.abs(best.nll));
    if (!(Math.abs(next.gradient) < Math.abs(best.gradient)) || next.nll > best.nll + roundingSlack) break;
    beta = candidate;
    best = next;
  }

  return {
    temperature: 1 / beta,
    nllBefore: meanNll(logits, gold, n, k, 1),
    nllAfter: best.nll,
  };
}
