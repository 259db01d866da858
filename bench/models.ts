// Model cost benchmark: evaluations per second of the B1 model (../shared/bench/PROBLEMS.md:
// 4096 pixels, pitch 5.5 µm, exact sin θ, 5-point Gauss–Legendre pixel averaging), value only
// and value + full Jacobian, beside NumPy evaluating the same formula in the same run.
// Run: npm run bench -- models
import { spawnSync } from "node:child_process";
import { getModel } from "../src/physics/registry.js";
import { paramVector, pixelPositions } from "../src/physics/simulate.js";
import type { Model } from "../src/physics/model.js";

const B1 = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1, pixelWidth: 5.5e-6 };
const BATCHES = 7;
const BATCH_SECONDS = 0.3;

/** Median over BATCHES batches of calls per second; each batch runs ≥ BATCH_SECONDS. */
function rate(call: () => void): number {
  for (let i = 0; i < 30; i++) call(); // warm-up: let the JIT settle
  const rates: number[] = [];
  for (let b = 0; b < BATCHES; b++) {
    let calls = 0;
    const start = process.hrtime.bigint();
    let elapsed = 0;
    do {
      for (let i = 0; i < 10; i++) call();
      calls += 10;
      elapsed = Number(process.hrtime.bigint() - start) / 1e9;
    } while (elapsed < BATCH_SECONDS);
    rates.push(calls / elapsed);
  }
  rates.sort((a, b) => a - b);
  return rates[Math.floor(BATCHES / 2)]!;
}

function measure(model: Model, values: Record<string, number>, x: Float64Array): { value: number; jacobian: number } {
  const params = paramVector(model, values);
  const out = new Float64Array(x.length);
  const jac = new Float64Array(x.length * model.parameters.length);
  return {
    value: rate(() => model.evaluate(x, params, out)),
    jacobian: rate(() => model.jacobian!(x, params, jac, out)),
  };
}

const NUMPY_SCRIPT = String.raw`
import json, sys, time
import numpy as np
cfg = json.load(sys.stdin)
x = np.array(cfg["x"])
p = cfg["p"]
nodes, weights = np.polynomial.legendre.leggauss(5)
off = nodes / 2; w = weights / 2
def model(jac):
    A, c, d, a, V, phi, lam, L, bg, slope, pw = (p[k] for k in ("amplitude","center","separation","width","visibility","phase","wavelength","distance","background","backgroundSlope","pixelWidth"))
    k = 2*np.pi/lam
    xs = x[:, None] + off[None, :]*pw
    u = xs - c
    r2 = u*u + L*L; r = np.sqrt(r2)
    s = u/r
    beta = 0.5*k*a*s
    sb = np.sin(beta)
    beta_safe = np.where(beta == 0, 1.0, beta)
    sinc = np.where(beta == 0, 1.0, sb/beta_safe)
    env = sinc*sinc
    path = k*d*s; g = path + phi
    cg = np.cos(g)
    fr = 1 + V*cg
    I = A*env*fr
    out = bg + slope*x + I @ w
    if not jac:
        return out
    dsinc = np.where(beta == 0, 0.0, (beta*np.cos(beta) - sb)/(beta_safe*beta_safe))
    dB = A*2*sinc*dsinc*fr
    dG = -A*env*V*np.sin(g)
    dS = dB*0.5*k*a + dG*k*d
    inv3 = 1/(r2*r)
    dU = dS*L*L*inv3
    cols = [env*fr, -dU, dG*k*s, dB*0.5*k*s, A*env*cg, dG, -(dB*beta + dG*path)/lam, dS*(-u*L*inv3)]
    J = np.empty((x.size, 12))
    for j, col in enumerate(cols):
        J[:, j] = col @ w
    J[:, 8] = 1; J[:, 9] = x; J[:, 10] = (dU*off[None, :]) @ w; J[:, 11] = 0
    return out, J
def rate(jac):
    for _ in range(10): model(jac)
    rates = []
    for _ in range(7):
        calls = 0; t0 = time.perf_counter()
        while True:
            for _ in range(5): model(jac)
            calls += 5
            el = time.perf_counter() - t0
            if el >= 0.3: break
        rates.append(calls/el)
    rates.sort(); return rates[3]
print(json.dumps({"value": rate(False), "jacobian": rate(True), "check": model(False)[:8].tolist(), "numpy": np.__version__}))
`;

/** B1 in NumPy (vectorised over pixels × nodes), timed by Python in this same run; null when NumPy is missing. */
function numpyReference(x: Float64Array): { value: number; jacobian: number; check: number[]; numpy: string } | null {
  const probe = spawnSync("/usr/bin/python3", ["-c", "import numpy"], { encoding: "utf8" });
  if (probe.status !== 0) return null;
  const input = JSON.stringify({ x: Array.from(x), p: { ...B1, backgroundSlope: 0 } });
  const result = spawnSync("/usr/bin/python3", ["-c", NUMPY_SCRIPT], { input, encoding: "utf8", maxBuffer: 16 << 20 });
  if (result.status !== 0) throw new Error(`NumPy reference failed: ${result.stderr}`);
  return JSON.parse(result.stdout);
}

export async function main(): Promise<void> {
  const x = pixelPositions(4096, 5.5e-6);
  const model = getModel("two-slit");
  console.log("models: B1 two-slit model, 4096 pixels, exact sin θ, 5-point Gauss–Legendre pixel averaging");
  console.log(`  method: median of ${BATCHES} batches (each ≥ ${BATCH_SECONDS} s) after a warm-up; Node ${process.version}; NumPy timed the same way in its own process, same run`);
  const ours = measure(model, B1, x);
  const reference = numpyReference(x);
  const fmt = (n: number): string => n.toFixed(0).padStart(8);
  console.log(`  fringekit  value:            ${fmt(ours.value)} evaluations/s  (${(1e6 / ours.value).toFixed(1)} µs each)`);
  console.log(`  fringekit  value + Jacobian: ${fmt(ours.jacobian)} evaluations/s  (${(1e6 / ours.jacobian).toFixed(1)} µs each, 12 columns)`);
  if (reference) {
    // same numbers? (guards against comparing different work)
    const check = new Float64Array(8);
    model.evaluate(x.subarray(0, 8), paramVector(model, B1), check);
    const agree = reference.check.every((v, i) => Math.abs(v - check[i]!) <= 1e-9 * Math.abs(v));
    console.log(`  NumPy ${reference.numpy} value:            ${fmt(reference.value)} evaluations/s`);
    console.log(`  NumPy ${reference.numpy} value + Jacobian: ${fmt(reference.jacobian)} evaluations/s`);
    console.log(`  ratio fringekit/NumPy (throughput, > 1 is faster): value ${(ours.value / reference.value).toFixed(2)}, value + Jacobian ${(ours.jacobian / reference.jacobian).toFixed(2)}; outputs agree: ${agree}`);
  } else {
    console.log("  NumPy reference skipped: /usr/bin/python3 with numpy is missing (apt-get install python3-scipy)");
  }
  // context: the costlier models on the same pixels (no reference)
  const context: [string, Record<string, number>][] = [
    ["two-slit-broadband", { ...B1, bandwidth: 2e-9 }],
    ["n-slit", { amplitude: 20000, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, slits: 5, pixelWidth: 5.5e-6 }],
    ["two-slit-fresnel", { amplitude: 100, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, slits: 2, distance: 0.05, pixelWidth: 5.5e-6 }],
  ];
  for (const [id, values] of context) {
    const m = measure(getModel(id), values, x);
    console.log(`  ${id.padEnd(20)} value ${fmt(m.value)} /s, value + Jacobian ${fmt(m.jacobian)} /s`);
  }
}
