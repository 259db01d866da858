// Profiles simulated outside the project's model code: NumPy/SciPy (Debian python3-numpy,
// python3-scipy) evaluating the published expressions written out below, with a seeded NumPy
// generator for Poisson or gaussian noise. Each case names its source in the script.
import { python, scipyMissing } from "../stats/python.js";
import type { Profile } from "../../src/profile.js";

export { scipyMissing };

/** One simulated case: kind (see SCRIPT), truth and geometry (SI), point count and noise. */
export interface ReferenceCase {
  kind: string;
  truth: Record<string, number>;
  pixels?: number;
  pitch?: number;
  /** Separations (m) of a coherence scan. */
  separations?: number[];
  /** Gaussian σ of a coherence scan's visibilities. */
  sigma?: number;
  /** Tabulated spectrum (wavelengths m, weights). */
  spectrum?: { wavelengths: number[]; weights: number[] };
  seed: number;
}

const SCRIPT = String.raw`
import numpy as np
from scipy.special import fresnel, j1

def sinc2(beta):
    # sin²β/β² (np.sinc(t) = sin(πt)/(πt))
    return np.sinc(beta / np.pi) ** 2

def two_slit(s, p, lam):
    # Fraunhofer two-slit pattern, Born & Wolf §8.6 / Hecht §10.2:
    # A sinc²(π a s/λ) [1 + V cos(2π d s/λ + φ)]
    return p["amplitude"] * sinc2(np.pi * p["width"] * s / lam) * (1 + p["visibility"] * np.cos(2 * np.pi * p["separation"] * s / lam + p["phase"]))

out = []
for case in data["cases"]:
    rng = np.random.default_rng(case["seed"])
    p = case["truth"]
    kind = case["kind"]
    if kind in ("coherence-disc", "coherence-gaussian"):
        d = np.array(case["separations"])
        lam, R = p["wavelength"], p["sourceDistance"]
        if kind == "coherence-disc":
            # van Cittert–Zernike, uniform disc (Goodman, Statistical Optics §5.6; Born & Wolf §10.4.3): |2 J1(v)/v|, v = π D d/(λ R)
            v = np.pi * p["diameter"] * d / (lam * R)
            mean = p["visibility"] * np.abs(2 * j1(v) / v)
        else:
            # Gaussian source of rms width σ: exp(−2π²σ²d²/(λR)²) (Fourier transform of a Gaussian)
            mean = p["visibility"] * np.exp(-2 * np.pi ** 2 * p["rmsSize"] ** 2 * d ** 2 / (lam * R) ** 2)
        y = mean + case["sigma"] * rng.standard_normal(d.size)
        out.append({"x": d.tolist(), "y": y.tolist(), "sigma": [case["sigma"]] * d.size})
        continue
    n = case["pixels"]
    x = (np.arange(n) - n / 2) * case["pitch"]
    u = x - p["center"]
    if kind == "two-slit-fresnel":
        # Fresnel diffraction by N slits (Born & Wolf §8.7; Goodman, Fourier Optics §4.2):
        # I = A/2 |Σ_j [E(u_j+) − E(u_j−)]|², E = C + iS, u_j± = √(2/(λL)) (c_j ± a/2 − v)
        q = np.sqrt(2 / (p["wavelength"] * p["distance"]))
        field = np.zeros(n, dtype=complex)
        N = int(p.get("slits", 2))
        for j in range(N):
            c = (j - (N - 1) / 2) * p["separation"]
            Sp, Cp = fresnel(q * (c + p["width"] / 2 - u))
            Sm, Cm = fresnel(q * (c - p["width"] / 2 - u))
            field += (Cp - Cm) + 1j * (Sp - Sm)
        mean = 0.5 * p["amplitude"] * np.abs(field) ** 2
    else:
        L = p["distance"]
        s = u / np.sqrt(u * u + L * L)
        if kind == "two-slit":
            mean = two_slit(s, p, p["wavelength"])
        elif kind == "single-slit":
            mean = p["amplitude"] * sinc2(np.pi * p["width"] * s / p["wavelength"])
        elif kind == "n-slit":
            # N-slit grating (Hecht §10.2.3): A sinc²(π a s/λ) [sin(Nφ)/(N sin φ)]², φ = π d s/λ
            N = int(p["slits"])
            phi = np.pi * p["separation"] * s / p["wavelength"]
            den = N * np.sin(phi)
            g = np.where(np.abs(den) < 1e-12, 1.0, np.sin(N * phi) / np.where(np.abs(den) < 1e-12, 1.0, den))
            mean = p["amplitude"] * sinc2(np.pi * p["width"] * s / p["wavelength"]) * g ** 2
        elif kind == "two-beam":
            mean = p["amplitude"] * np.exp(-2 * u * u / p["beamWaist"] ** 2) * (1 + p["visibility"] * np.cos(2 * np.pi * p["separation"] * s / p["wavelength"] + p["phase"]))
        elif kind == "two-slit-broadband":
            # Two-slit pattern averaged numerically over a Gaussian spectrum in wavenumber of FWHM
            # Δλ (σk = 2πΔλ/λ0² / 2.3548), 401 samples over ±5σk (envelope included at each k)
            lam0, fwhm = p["wavelength"], p["bandwidth"]
            k0 = 2 * np.pi / lam0
            sk = 2 * np.pi * fwhm / lam0 ** 2 / (2 * np.sqrt(2 * np.log(2)))
            ks = k0 + np.linspace(-5, 5, 401) * sk
            w = np.exp(-0.5 * ((ks - k0) / sk) ** 2)
            w /= w.sum()
            mean = sum(wi * two_slit(s, p, 2 * np.pi / k) for wi, k in zip(w, ks))
        elif kind == "two-slit-spectrum":
            # Tabulated spectrum: trapezoid-weighted sum of two-slit patterns over the table
            lams = np.array(case["spectrum"]["wavelengths"]); w = np.array(case["spectrum"]["weights"], dtype=float)
            tw = w.copy(); tw[0] *= 0.5; tw[-1] *= 0.5
            tw /= tw.sum()
            mean = sum(wi * two_slit(s, p, lam) for wi, lam in zip(tw, lams))
        elif kind in ("two-slit-disc-source", "two-slit-gaussian-source"):
            lam, R, d = p["wavelength"], p["sourceDistance"], p["separation"]
            if kind == "two-slit-disc-source":
                v = np.pi * p["diameter"] * d / (lam * R)
                mu = abs(2 * j1(v) / v)
            else:
                mu = np.exp(-2 * np.pi ** 2 * p["rmsSize"] ** 2 * d ** 2 / (lam * R) ** 2)
            mean = two_slit(s, {**p, "visibility": p["visibility"] * mu}, lam)
        else:
            raise ValueError(kind)
    mean = mean + p["background"]
    y = rng.poisson(mean).astype(float)
    out.append({"x": x.tolist(), "y": y.tolist()})
print(json.dumps(out))
`;

/** Simulates every case in one Python run; profiles in the same order. */
export function referenceProfiles(cases: ReferenceCase[]): Profile[] {
  const made = python<{ x: number[]; y: number[]; sigma?: number[] }[]>(SCRIPT, { cases });
  return made.map((m) => {
    const profile: Profile = { x: Float64Array.from(m.x), y: Float64Array.from(m.y), yUnit: m.sigma ? "1" : "counts", counts: !m.sigma };
    if (m.sigma) profile.sigma = Float64Array.from(m.sigma);
    return profile;
  });
}
