/**
 * The JSON forms of the configuration files, as TypeScript types (what
 * {@link validateConfig} returns for each kind).
 *
 * @module
 */
import type { CameraParameters } from '../../camera/index.js';
import type { Mat3 } from '../../core/index.js';
import type { ApertureArraySpec, ExpectedSea, SensorDesignInput } from '../../sensor/index.js';

/** The design calculator's input as JSON: {@link sensor!SensorDesignInput} with the spectrum as plain arrays. */
export interface SensorDesignJson extends Omit<SensorDesignInput, 'sea'> {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The expected sea. */
  sea?: Omit<ExpectedSea, 'spectrum'> & { spectrum?: { k: number[]; F: number[] } };
}

/** A built sensor as JSON (see `SENSOR_SCHEMA`). */
export interface SensorJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The aperture array. */
  apertures: ApertureArraySpec;
  /** Mask depth below the mean water level, metres. */
  maskDepth: number;
  /** Mask-to-plane distance, metres. */
  planeDistance: number;
  /** World (x, y) of the array centre, metres. @defaultValue [0, 0] */
  position?: [number, number];
  /** Sensor → world rotation, row-major. @defaultValue identity */
  rotation?: Mat3;
  /** Half-widths of the detection plane, metres. @defaultValue unbounded */
  planeHalfSize?: [number, number];
  /** Refractive index of air. @defaultValue 1.000293 */
  nAir?: number;
  /** Refractive index of water. @defaultValue 1.333 */
  nWater?: number;
}

/** A view by pixel size (see `CAMERA_SCHEMA`). */
export interface PlaneCameraJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The form. */
  kind: 'plane';
  /** Image width, pixels. */
  width: number;
  /** Image height, pixels. */
  height: number;
  /** Size of one pixel on the plane, metres. */
  pixelSize: number;
  /** Plane coordinates at the image centre, metres. @defaultValue [0, 0] */
  centre?: [number, number];
  /** Image rows along +y. @defaultValue false */
  yDown?: boolean;
}

/** A view by homography. */
export interface HomographyCameraJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The form. */
  kind: 'homography';
  /** Image width, pixels. */
  width: number;
  /** Image height, pixels. */
  height: number;
  /** Plane → pixel homography, row-major. */
  planeToPixel: Mat3;
}

/** A camera pose as JSON: by rotation and centre, or by where it looks. */
export type PoseJson =
  | { rotation: Mat3; position: [number, number, number] }
  | { eye: [number, number, number]; target: [number, number, number]; up?: [number, number, number] };

/** A view by camera model and pose. */
export interface ModelCameraJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The form. */
  kind: 'camera';
  /** Image width, pixels. */
  width: number;
  /** Image height, pixels. */
  height: number;
  /** The camera model's parameters. */
  camera: CameraParameters;
  /** Camera → world rotation (row-major) and centre (metres), or eye, target and up. */
  pose: PoseJson;
}

/** Any camera view as JSON. */
export type CameraJson = PlaneCameraJson | HomographyCameraJson | ModelCameraJson;

/** The sun as JSON. */
export interface SunLightJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The source. */
  kind: 'sun';
  /** UTC instant: ISO 8601 string or milliseconds since the epoch. */
  time: string | number;
  /** The site. */
  site: { latitudeDeg: number; longitudeDeg: number; height?: number };
  /** Atmospheric refraction. @defaultValue true */
  refraction?: boolean;
  /** Air pressure, hPa. @defaultValue 1010 */
  pressureHPa?: number;
  /** Air temperature, °C. @defaultValue 10 */
  temperatureC?: number;
}

/** A collimated lamp as JSON. */
export interface CollimatedLightJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The source. */
  kind: 'collimated';
  /** Vector towards the lamp, world frame (normalised on use). */
  toLight: [number, number, number];
  /** Angular radius, radians. @defaultValue 0 */
  angularRadius?: number;
}

/** A point lamp as JSON. */
export interface PointLightJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The source. */
  kind: 'point';
  /** Lamp position, metres. */
  position: [number, number, number];
  /** Emitter radius, metres. @defaultValue 0 */
  radius?: number;
}

/** Any guide light as JSON. */
export type LightJson = SunLightJson | CollimatedLightJson | PointLightJson;
