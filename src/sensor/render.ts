/**
 * Rendered frames: a synthetic picture of the detection plane as the camera sees it,
 * for tests and demonstrations of the measurement chain.
 *
 * @module
 */
import { checkBoolean, checkFinite, checkInteger, checkNonNegative, checkOptions, checkPositive, createImage, createRng, Status, typeError } from '../core/index.js';
import type { Image } from '../core/index.js';
import type { GuideLight } from '../sun/index.js';
import type { SpotTrace } from './forward.js';
import { planeMapper } from './view.js';
import type { PlaneView } from './view.js';

/** Options of {@link renderSpotFrame}. */
export interface RenderSpotFrameOptions {
  /** Photo-electrons collected per spot. @defaultValue 20000 */
  photonsPerSpot?: number;
  /** Background photo-electrons per pixel (stray light, diffuser glow). @defaultValue 20 */
  background?: number;
  /** Read noise, electrons RMS. @defaultValue 2 */
  readNoise?: number;
  /** Electrons per count. @defaultValue 1 */
  gain?: number;
  /** Full scale of the detector, counts; values are clipped to `[0, saturation]`. @defaultValue 65535 */
  saturation?: number;
  /** Blur of the diffuser (or the camera's point-spread function) on the plane, Gaussian σ, metres. @defaultValue 0 */
  diffuserBlur?: number;
  /** Wavelength of the guide light in vacuum, nanometres, for diffraction. @defaultValue 550 */
  wavelengthNm?: number;
  /** Replace the physical spot by a Gaussian of this σ on the plane, metres (for estimator tests). */
  gaussianSigma?: number;
  /** Sub-samples per pixel side for the pixel integral. @defaultValue 3 */
  supersample?: number;
  /** Add photon and read noise. @defaultValue true */
  noise?: boolean;
  /** Seed of the noise generator. @defaultValue 1 */
  seed?: number;
}

/** A rendered frame and the true spot centres in it. */
export interface RenderedFrame {
  /** The frame, counts, one channel. */
  readonly image: Image;
  /** True spot centres, pixels, packed `u v u v …` per aperture (NaN where no light arrives or it falls outside). */
  readonly centres: Float64Array;
  /** The spot profile's radius holding all its light, metres on the plane. */
  readonly spotRadius: number;
  /** The Gaussian-equivalent σ of the spot profile, metres on the plane. */
  readonly spotSigma: number;
}

// exp(−x) I0(x), Abramowitz & Stegun 9.8.1–9.8.2.
function besselI0e(x: number): number {
  const ax = Math.abs(x);
  if (ax <= 3.75) {
    const t = (ax / 3.75) ** 2;
    return Math.exp(-ax) * (1 + t * (3.5156229 + t * (3.0899424 + t * (1.2067492 + t * (0.2659732 + t * (0.0360768 + t * 0.0045813))))));
  }
  const t = 3.75 / ax;
  return (
    (0.39894228 + t * (0.01328592 + t * (0.00225319 + t * (-0.00157565 + t * (0.00916281 + t * (-0.02057706 + t * (0.02635537 + t * (-0.01647633 + t * 0.00392377)))))))) /
    Math.sqrt(ax)
  );
}

// Area density (1/m²) of two uniform discs (radii a, b) convolved, at radius r.
function discDisc(a: number, b: number, r: number): number {
  if (b < 1e-3 * a) return r <= a ? 1 / (Math.PI * a * a) : 0;
  if (a < 1e-3 * b) return r <= b ? 1 / (Math.PI * b * b) : 0;
  if (r >= a + b) return 0;
  let area: number;
  if (r <= Math.abs(a - b)) area = Math.PI * Math.min(a, b) ** 2;
  else {
    const ca = Math.min(1, Math.max(-1, (r * r + a * a - b * b) / (2 * r * a)));
    const cb = Math.min(1, Math.max(-1, (r * r + b * b - a * a) / (2 * r * b)));
    area = a * a * Math.acos(ca) + b * b * Math.acos(cb) - 0.5 * Math.sqrt(Math.max(0, (-r + a + b) * (r + a - b) * (r - a + b) * (r + a + b)));
  }
  return area / (Math.PI * a * a * Math.PI * b * b);
}

/** @internal A radial spot profile sampled for fast lookup: density per m², ∫ = 1. */
export interface SpotProfile {
  readonly radius: number;
  readonly step: number;
  readonly table: Float64Array;
  readonly sigma: number;
}

/**
 * @internal The radial profile of (aperture disc ⊛ source disc ⊛ Gaussian blur): the
 * disc–disc part in closed form (overlap of two circles), the Gaussian by its radial
 * (Hankel-free) form with the modified Bessel function I0.
 */
export function spotProfile(apertureRadius: number, sourceRadius: number, blurSigma: number): SpotProfile {
  const a = apertureRadius, b = sourceRadius, s = blurSigma;
  const radius = a + b + 5 * s;
  const N = 512;
  const step = radius / (N - 1);
  const table = new Float64Array(N + 1);
  const rhoMax = a + b;
  const dr = Math.min(s / 6, Math.max(rhoMax, s) / 400);
  for (let i = 0; i < N; i++) {
    const r = i * step;
    let acc = 0;
    const lo = Math.max(0, r - 7 * s), hi = Math.min(rhoMax, r + 7 * s);
    if (hi > lo) {
      const m = Math.max(8, Math.ceil((hi - lo) / dr));
      const h = (hi - lo) / m;
      for (let k = 0; k <= m; k++) {
        const rho = lo + k * h;
        const w = k === 0 || k === m ? 0.5 : 1;
        acc += w * discDisc(a, b, rho) * Math.exp(-((r - rho) ** 2) / (2 * s * s)) * besselI0e((r * rho) / (s * s)) * rho;
      }
      acc *= h / (s * s);
    }
    table[i] = acc;
  }
  // Normalise numerically (∫ 2π r P dr = 1) and measure the Gaussian-equivalent σ.
  let tot = 0, m2 = 0;
  for (let i = 0; i < N; i++) {
    const r = i * step;
    const w = (i === 0 || i === N - 1 ? 0.5 : 1) * 2 * Math.PI * r * table[i]! * step;
    tot += w;
    m2 += w * r * r;
  }
  for (let i = 0; i < N; i++) table[i]! /= tot;
  return { radius, step, table, sigma: Math.sqrt(m2 / tot / 2) };
}

function gaussianProfile(sigma: number): SpotProfile {
  const radius = 5 * sigma;
  const N = 512;
  const step = radius / (N - 1);
  const table = new Float64Array(N + 1);
  for (let i = 0; i < N; i++) {
    const r = i * step;
    table[i] = Math.exp(-(r * r) / (2 * sigma * sigma)) / (2 * Math.PI * sigma * sigma);
  }
  return { radius, step, table, sigma };
}

/**
 * Render the detection plane as the camera sees it. Each spot is the source disc
 * (angular radius from the guide light, narrowed by refraction into water) seen through
 * the aperture (its geometric shadow for a pinhole, its defocus disc for a lenslet),
 * blurred by diffraction (the Airy core as a Gaussian, σ ≈ 0.42 λ·L/D) and the diffuser,
 * integrated over each pixel by sub-sampling, on a uniform background, with photon noise
 * (Poisson; its normal approximation above a mean of 40), read noise (Gaussian), gain and clipping at full scale. Only each spot's
 * bounding window is visited. The profile is computed once per frame for the mean path
 * length.
 *
 * @param trace - Spot positions from {@link traceSpots} (its geometry is used).
 * @param light - The guide light (its angular radius at the sensor).
 * @param view - How the camera sees the plane.
 * @param options - Flux, background, noise, blur, wavelength, seed.
 * @returns The frame and the true spot centres in pixels.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for malformed input or
 *   options out of range.
 * @see Born, M. & Wolf, E. (1999), Principles of Optics, §8.5.2 (Airy pattern);
 *   Zhang, B., Zerubia, J. & Olivo-Marin, J.-C. (2007), "Gaussian approximations of
 *   fluorescence microscope point-spread function models", Applied Optics 46(10), 1819
 *   (σ ≈ 0.42 λ N); Janesick, J. R. (2007), Photon Transfer, SPIE (photon, read noise).
 * @example
 * ```ts
 * const { image } = renderSpotFrame(traceSpots(g, sea, light), light, view, { seed: 3 });
 * ```
 */
export function renderSpotFrame(trace: SpotTrace, light: GuideLight, view: PlaneView, options?: RenderSpotFrameOptions): RenderedFrame {
  const fn = 'renderSpotFrame';
  if (trace === null || typeof trace !== 'object' || !(trace.x instanceof Float64Array) || trace.geometry === undefined) {
    typeError(fn, 'trace', trace, 'a SpotTrace from traceSpots');
  }
  if (light === null || typeof light !== 'object' || typeof light.angularRadius !== 'function') typeError(fn, 'light', light, 'a GuideLight');
  const o = checkOptions(fn, options);
  const flux = o.photonsPerSpot === undefined ? 20000 : checkNonNegative(fn, 'options.photonsPerSpot', o.photonsPerSpot);
  const bg = o.background === undefined ? 20 : checkNonNegative(fn, 'options.background', o.background);
  const readNoise = o.readNoise === undefined ? 2 : checkNonNegative(fn, 'options.readNoise', o.readNoise);
  const gain = o.gain === undefined ? 1 : checkPositive(fn, 'options.gain', o.gain);
  const saturation = o.saturation === undefined ? 65535 : checkPositive(fn, 'options.saturation', o.saturation);
  const blur = o.diffuserBlur === undefined ? 0 : checkNonNegative(fn, 'options.diffuserBlur', o.diffuserBlur);
  const lambda = (o.wavelengthNm === undefined ? 550 : checkPositive(fn, 'options.wavelengthNm', o.wavelengthNm)) * 1e-9;
  const ss = o.supersample === undefined ? 3 : checkInteger(fn, 'options.supersample', o.supersample, 1, 16);
  const noise = o.noise === undefined ? true : checkBoolean(fn, 'options.noise', o.noise);
  const seed = o.seed === undefined ? 1 : checkFinite(fn, 'options.seed', o.seed);
  const g = trace.geometry;
  const map = planeMapper(fn, view, g);
  const { width, height } = map;
  const n = g.apertures.count;

  // Mean path to the plane and the in-water angular radius of the source.
  let Lsum = 0, cnt = 0, czw = 0;
  for (let k = 0; k < n; k++) {
    if (trace.status[k] !== Status.ok) continue;
    Lsum += trace.pathToPlane[k]!;
    czw += -trace.directions[3 * k + 2]!;
    cnt++;
  }
  const L = cnt > 0 ? Lsum / cnt : g.planeDistance;
  const cosW = cnt > 0 ? Math.min(1, czw / cnt) : 1;
  const toL = light.toLight(g.centre as [number, number, number]);
  const cosA = Math.max(1e-6, toL[2]);
  const ratio = g.nAir / g.nWater;
  // Refraction narrows the cone: by n_a/n_w across the plane of incidence, by
  // n_a cos θa / (n_w cos θw) within it; the disc is taken round with their geometric mean.
  const alphaW = light.angularRadius(g.centre as [number, number, number]) * ratio * Math.sqrt(cosA / Math.max(1e-6, cosW));
  const D = g.apertures.apertureDiameter;
  const f = g.apertures.focalLength;
  const lambdaW = lambda / g.nWater;
  // Pixel scale at the array centre, for the minimum blur of a fraction of a pixel.
  const q0 = [0, 0], q1 = [0, 0];
  map.toPlane((width - 1) / 2, (height - 1) / 2, q0);
  map.toPlane((width - 1) / 2 + 1, (height - 1) / 2, q1);
  const pixelPlane = Math.hypot(q1[0]! - q0[0]!, q1[1]! - q0[1]!) || 1e-6;
  let profile: SpotProfile;
  if (o.gaussianSigma !== undefined) profile = gaussianProfile(checkPositive(fn, 'options.gaussianSigma', o.gaussianSigma));
  else {
    const sigmaDiff = (0.42 * lambdaW * (f ?? L)) / D;
    const apR = f === null ? D / 2 : (D / 2) * Math.abs(L - f) / f;
    const srcR = alphaW * L;
    const s = Math.sqrt(sigmaDiff * sigmaDiff + blur * blur + (0.25 * pixelPlane) ** 2);
    profile = spotProfile(apR, srcR, s);
  }

  const image = createImage(width, height, 1);
  const data = image.data;
  const signal = new Float64Array(width * height);
  const centres = new Float64Array(2 * n).fill(NaN);
  const c = [0, 0], cu = [0, 0], cv = [0, 0];
  const inv = map.inverse;
  const tab = profile.table, step = profile.step, R = profile.radius, R2 = R * R;
  const sub = 1 / ss;
  for (let k = 0; k < n; k++) {
    if (trace.status[k] !== Status.ok) continue;
    const sx = trace.x[k]!, sy = trace.y[k]!;
    if (!map.toPixel(sx, sy, c)) continue;
    const u0 = c[0]!, v0 = c[1]!;
    centres[2 * k] = u0;
    centres[2 * k + 1] = v0;
    // Local pixel area on the plane and window size.
    if (!map.toPlane(u0 + 1, v0, cu) || !map.toPlane(u0, v0 + 1, cv) || !map.toPlane(u0, v0, c)) continue;
    const j00 = cu[0]! - c[0]!, j10 = cu[1]! - c[1]!, j01 = cv[0]! - c[0]!, j11 = cv[1]! - c[1]!;
    const area = Math.abs(j00 * j11 - j01 * j10);
    const minScale = Math.min(Math.hypot(j00, j10), Math.hypot(j01, j11));
    const wpx = Math.ceil((1.3 * R) / minScale) + 1;
    const ua = Math.max(0, Math.floor(u0) - wpx), ub = Math.min(width - 1, Math.ceil(u0) + wpx);
    const va = Math.max(0, Math.floor(v0) - wpx), vb = Math.min(height - 1, Math.ceil(v0) + wpx);
    if (ua > ub || va > vb) continue;
    const scale = (flux * area) / (ss * ss);
    const pt = [0, 0];
    for (let v = va; v <= vb; v++) {
      for (let u = ua; u <= ub; u++) {
        let acc = 0;
        for (let b = 0; b < ss; b++) {
          const vv = v - 0.5 + (b + 0.5) * sub;
          for (let a = 0; a < ss; a++) {
            const uu = u - 0.5 + (a + 0.5) * sub;
            let x: number, y: number;
            if (inv !== null) {
              const w = inv[6] * uu + inv[7] * vv + inv[8];
              x = (inv[0] * uu + inv[1] * vv + inv[2]) / w;
              y = (inv[3] * uu + inv[4] * vv + inv[5]) / w;
            } else {
              if (!map.toPlane(uu, vv, pt)) continue;
              x = pt[0]!;
              y = pt[1]!;
            }
            const dx = x - sx, dy = y - sy;
            const r2 = dx * dx + dy * dy;
            if (r2 >= R2) continue;
            const t = Math.sqrt(r2) / step;
            const i = t | 0;
            const fr = t - i;
            acc += tab[i]! + fr * (tab[i + 1]! - tab[i]!);
          }
        }
        signal[v * width + u]! += acc * scale;
      }
    }
  }
  const rng = createRng(seed);
  for (let p = 0; p < width * height; p++) {
    const mu = signal[p]! + bg;
    let e: number;
    if (!noise) e = mu;
    else {
      e = poisson(mu, rng) + (readNoise > 0 ? rng.normal(0, readNoise) : 0);
    }
    const cval = e / gain;
    data[p] = cval < 0 ? 0 : cval > saturation ? saturation : cval;
  }
  return { image, centres, spotRadius: R, spotSigma: profile.sigma };
}

function poisson(mu: number, rng: ReturnType<typeof createRng>): number {
  if (mu <= 0) return 0;
  if (mu > 40) return mu + Math.sqrt(mu) * rng.normal();
  // Knuth's multiplication method (exact for small means).
  const L = Math.exp(-mu);
  let k = 0, p = 1;
  do {
    k++;
    p *= rng.random();
  } while (p > L);
  return k - 1;
}
