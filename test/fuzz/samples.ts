/**
 * Well-formed library objects (small), built from the loaded areas, for the generic layer
 * to pass where an export wants a camera, a surface, a light … and for the method layer
 * to fuzz their methods. Each is built in its own try: an area may be mid-change.
 */
/* eslint-disable @typescript-eslint/no-explicit-any */
type Mods = Map<string, Record<string, any> | null>;

export function buildSamples(m: Mods): unknown[] {
  const out: unknown[] = [];
  const core = m.get('core') ?? {};
  const camera = m.get('camera') ?? {};
  const surface = m.get('surface') ?? {};
  const sun = m.get('sun') ?? {};
  const sensor = m.get('sensor') ?? {};
  const integrate = m.get('integrate') ?? {};
  const waves = m.get('waves') ?? {};
  const put = (make: () => unknown): unknown => {
    try {
      const v = make();
      out.push(v);
      return v;
    } catch {
      return undefined;
    }
  };
  const grid = put(() => core.createGrid({ width: 5, height: 4, dx: 0.01 }, Float64Array.from({ length: 20 }, (_, k) => 0.001 * Math.sin(k))));
  put(() => core.createImage(6, 5, 1, Float32Array.from({ length: 30 }, (_, k) => (k % 5) / 5)));
  put(() => core.createRng(5));
  const pin = put(() => new camera.PinholeCamera({ model: 'pinhole', fx: 50, fy: 50, cx: 16, cy: 12, k1: -0.1, width: 32, height: 24 }));
  put(() => new camera.FisheyeCamera({ model: 'fisheye', fx: 20, fy: 20, cx: 16, cy: 16, k1: 0.01, width: 32, height: 32 }));
  put(() => new camera.OrthographicCamera({ model: 'orthographic', fx: 100, fy: 100, cx: 16, cy: 16 }));
  put(() => new camera.FlatPortHousing({ camera: pin, distance: 0.02, thickness: 0.01, nGlass: 1.49, nWater: 1.333 }));
  put(() => camera.lookAt([0, 0, 2], [0, 0, 0], [0, 1, 0]));
  put(() => surface.createPlaneSurface({ domain: { xMin: -1, xMax: 1, yMin: -1, yMax: 1 } }));
  put(() => surface.createGridSurface(grid));
  put(() => surface.createSinusoidSurface({ components: [{ amplitude: 0.002, kx: 100, omega: 35 }] }));
  put(() => surface.createGaussianSurface({ bumps: [{ amplitude: 0.01, x: 0, y: 0, sigmaX: 0.05 }] }));
  const light = put(() => sun.createCollimatedLight([0.1, 0, 1]));
  put(() => sun.createPointLight([0, 0, 3], 0.01));
  put(() => sun.createSunLight(Date.UTC(2024, 5, 21, 12), { latitudeDeg: 43, longitudeDeg: 5 }));
  const arr = put(() => sensor.createApertureArray({ lattice: 'square', pitch: 0.01, columns: 3, rows: 3, apertureDiameter: 0.001 }));
  put(() => sensor.createApertureArray({ lattice: 'hexagonal', pitch: 0.01, columns: 3, rows: 3, apertureDiameter: 0.001 }));
  const geom = put(() => sensor.createSensorGeometry({ apertures: arr, maskDepth: 0.3, planeDistance: 0.05 }));
  put(() => sensor.createPlaneView({ width: 48, height: 48, pixelSize: 1e-3 }));
  put(() => sensor.referenceSpots(geom, light));
  put(() => integrate.prepareDctPoisson({ width: 4, height: 4 }));
  put(() => integrate.prepareFrankotChellappa({ width: 4, height: 4 }));
  put(() => integrate.prepareLeastSquares({ width: 4, height: 4 }));
  put(() => integrate.prepareIntegrator({ width: 4, height: 4 }));
  put(() => {
    const p = waves.tankSeaPreset();
    return waves.prepareRandomSea({ width: 8, height: 8, dx: p.grid.dx }, p.sea, { seed: 1 });
  });
  return out.filter((v) => v !== undefined);
}
