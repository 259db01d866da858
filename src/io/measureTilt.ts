/**
 * Fringe tilt from the phase of the dominant fringe component, row by row. Each row is
 * demodulated at the fringe frequency f (cycles/pixel along the rows); fringes whose normal is
 * tilted by θ advance that phase by 2π f tan θ per row. The phase slope is taken from lag
 * products Σ Z(r + L) Z*(r) at growing lags (unwrapped step by step), then refined by a weighted
 * least-squares line through all row phases (weights |Z(r)|², so dim and noisy rows count
 * little); f itself comes from the averaged row power spectrum and is refined from the phase
 * difference between the left and right halves of the rows. Method: quadrature demodulation
 * and phase-slope fitting, Kay (1989), "A fast and accurate single frequency estimator", IEEE
 * Trans. ASSP 37, 1987–1990 (weighted phase differences); Takeda, Ina & Kobayashi (1982),
 * "Fourier-transform method of fringe-pattern analysis", J. Opt. Soc. Am. 72, 156–160.
 */

/**
 * Angle (rad) of the fringe normal from the image x axis (rows), y pointing down the rows;
 * 0 for fringes that vary along x only. Pixels with `skip[i]` non-zero (saturated, hot) are left
 * out of each row's demodulation. Returns 0 when the region holds no fringes to measure
 * (fewer than 3 rows or 16 columns, or no modulation).
 * @param pixels row-major values, width × height (any linear intensity unit)
 * @param width  pixels per row
 * @param height rows
 * @param skip   optional flags of pixels to leave out (saturated, hot)
 */
export function measureTilt(pixels: ArrayLike<number>, width: number, height: number, skip?: Uint8Array): number {
  if (height < 3 || width < 16) return 0;
  const f0 = dominantFrequency(pixels, width, height, skip);
  if (f0 === undefined) return 0;
  // Refine f from the phase drift between the row halves (half-row centres are width/2 apart).
  const first = demodulateRows(pixels, width, height, skip, f0);
  const drift = Math.atan2(first.driftIm, first.driftRe);
  const f = f0 + drift / (Math.PI * width);
  const { re, im } = f === f0 ? first : demodulateRows(pixels, width, height, skip, f);
  const step = phaseSlope(re, im);
  if (step === undefined) return 0;
  const angle = Math.atan(step / (2 * Math.PI * f));
  return Number.isFinite(angle) ? angle : 0;
}

/** Fringe frequency (cycles/pixel) of the largest peak of the summed row power spectra, or undefined. */
function dominantFrequency(pixels: ArrayLike<number>, width: number, height: number, skip?: Uint8Array): number | undefined {
  let n = 1;
  while (n < 2 * width) n *= 2;
  const power = new Float64Array(n / 2 + 1);
  const re = new Float64Array(n), im = new Float64Array(n);
  const rows = Math.min(height, 64);
  for (let k = 0; k < rows; k++) {
    const r = Math.floor(((k + 0.5) * height) / rows);
    re.fill(0);
    im.fill(0);
    const mean = rowMean(pixels, width, r, skip);
    for (let c = 0; c < width; c++) {
      const i = r * width + c;
      if (skip && skip[i]) continue;
      re[c] = ((pixels[i] as number) - mean) * hann(c, width);
    }
    fft(re, im);
    for (let j = 0; j <= n / 2; j++) power[j] += re[j]! * re[j]! + im[j]! * im[j]!;
  }
  // Below three cycles across the row lies the slow envelope of the beam, not fringes. Power is
  // not weighted by frequency: a fixed column pattern near the Nyquist frequency would win.
  const low = Math.max(2, Math.ceil((3 * n) / width));
  let best = -1, bestPower = 0;
  for (let j = low; j < n / 2; j++) {
    if (power[j]! > bestPower && power[j]! >= power[j - 1]! && power[j]! >= power[j + 1]!) { best = j; bestPower = power[j]!; }
  }
  if (best < 0) return undefined;
  // Vertex of a parabola through the log powers around the peak (Gaussian-peak interpolation).
  const [l, c, r] = [Math.log(power[best - 1]! + 1e-300), Math.log(power[best]!), Math.log(power[best + 1]! + 1e-300)];
  const denominator = l - 2 * c + r;
  const offset = denominator < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (l - r)) / denominator)) : 0;
  return (best + offset) / n;
}

/** Hann-windowed demodulation of every row at f (cycles/pixel): Z(r) and Σ Z_right Z_left* over rows. */
function demodulateRows(pixels: ArrayLike<number>, width: number, height: number, skip: Uint8Array | undefined, f: number) {
  const half = Math.floor(width / 2);
  const cosW = new Float64Array(width), sinW = new Float64Array(width), cosH = new Float64Array(width), sinH = new Float64Array(width);
  for (let c = 0; c < width; c++) {
    const phase = 2 * Math.PI * f * c;
    const w = hann(c, width), h = c < half ? hann(c, half) : hann(c - half, width - half);
    cosW[c] = w * Math.cos(phase);
    sinW[c] = -w * Math.sin(phase);
    cosH[c] = h * Math.cos(phase);
    sinH[c] = -h * Math.sin(phase);
  }
  const re = new Float64Array(height), im = new Float64Array(height);
  let driftRe = 0, driftIm = 0;
  for (let r = 0; r < height; r++) {
    const mean = rowMean(pixels, width, r, skip);
    let zr = 0, zi = 0, lr = 0, li = 0, rr = 0, ri = 0;
    const row = r * width;
    for (let c = 0; c < width; c++) {
      if (skip && skip[row + c]) continue;
      const v = (pixels[row + c] as number) - mean;
      zr += v * cosW[c]!;
      zi += v * sinW[c]!;
      if (c < half) { lr += v * cosH[c]!; li += v * sinH[c]!; } else { rr += v * cosH[c]!; ri += v * sinH[c]!; }
    }
    re[r] = zr;
    im[r] = zi;
    driftRe += rr * lr + ri * li;
    driftIm += ri * lr - rr * li;
  }
  return { re, im, driftRe, driftIm };
}

/** Phase advance per row (rad) of Z(r): lag products at growing lags, then a weighted line through all row phases. */
function phaseSlope(re: Float64Array, im: Float64Array): number | undefined {
  const n = re.length;
  const lagPhase = (lag: number): number => {
    let sr = 0, si = 0;
    for (let r = 0; r + lag < n; r++) {
      sr += re[r + lag]! * re[r]! + im[r + lag]! * im[r]!;
      si += im[r + lag]! * re[r]! - re[r + lag]! * im[r]!;
    }
    return sr === 0 && si === 0 ? NaN : Math.atan2(si, sr);
  };
  let step = lagPhase(1);
  if (!Number.isFinite(step)) return undefined;
  for (let lag = 4; lag <= n / 2; lag *= 4) step = (step * lag + wrap(lagPhase(lag) - step * lag)) / lag;
  // Two rounds of a weighted least-squares line through the de-rotated row phases.
  for (let round = 0; round < 2; round++) {
    let cr = 0, ci = 0;
    for (let r = 0; r < n; r++) {
      const a = -step * r;
      cr += re[r]! * Math.cos(a) - im[r]! * Math.sin(a);
      ci += re[r]! * Math.sin(a) + im[r]! * Math.cos(a);
    }
    const reference = Math.atan2(ci, cr);
    let sw = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
    for (let r = 0; r < n; r++) {
      const w = re[r]! * re[r]! + im[r]! * im[r]!;
      if (w === 0) continue;
      const y = wrap(Math.atan2(im[r]!, re[r]!) - step * r - reference);
      sw += w; sx += w * r; sy += w * y; sxx += w * r * r; sxy += w * r * y;
    }
    const denominator = sw * sxx - sx * sx;
    if (!(denominator > 0)) break;
    step += (sw * sxy - sx * sy) / denominator;
  }
  return step;
}

function rowMean(pixels: ArrayLike<number>, width: number, r: number, skip?: Uint8Array): number {
  let sum = 0, count = 0;
  for (let c = 0, i = r * width; c < width; c++, i++) {
    if (skip && skip[i]) continue;
    sum += pixels[i] as number;
    count++;
  }
  return count > 0 ? sum / count : 0;
}

function hann(c: number, n: number): number {
  return 0.5 - 0.5 * Math.cos((2 * Math.PI * (c + 0.5)) / n);
}

function wrap(a: number): number {
  return a - 2 * Math.PI * Math.round(a / (2 * Math.PI));
}

/** In-place radix-2 complex FFT (length a power of 2), Cooley & Tukey (1965), Math. Comp. 19, 297–301. */
function fft(re: Float64Array, im: Float64Array): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      [re[i], re[j]] = [re[j]!, re[i]!];
      [im[i], im[j]] = [im[j]!, im[i]!];
    }
  }
  for (let size = 2; size <= n; size *= 2) {
    const angle = (-2 * Math.PI) / size;
    const wr = Math.cos(angle), wi = Math.sin(angle);
    for (let start = 0; start < n; start += size) {
      let cr = 1, ci = 0;
      for (let k = 0; k < size / 2; k++) {
        const a = start + k, b = a + size / 2;
        const tr = re[b]! * cr - im[b]! * ci, ti = re[b]! * ci + im[b]! * cr;
        re[b] = re[a]! - tr; im[b] = im[a]! - ti;
        re[a] = re[a]! + tr; im[a] = im[a]! + ti;
        const next = cr * wr - ci * wi;
        ci = cr * wi + ci * wr;
        cr = next;
      }
    }
  }
}
