/**
 * The vehicle file format (vehicles/<name>/vehicle.json): a JSON Schema for its
 * structure and types, and the physical ranges every value must respect.
 * The schema is typed against `Vehicle` (src/vehicle/types.ts); ranges are
 * checked after the schema so that each message can quote the value found.
 */
import type { Vehicle } from './types.js';

type VehicleField = keyof Vehicle & string;

const number = (description: string) => ({ type: 'number', description }) as const;

/** JSON Schema (draft-07 vocabulary, as ajv reads it) of a vehicle file. */
export const VEHICLE_SCHEMA = {
  title: 'speedband vehicle file',
  type: 'object',
  additionalProperties: false,
  required: [
    'name',
    'mass_kg',
    'yawInertia_kgm2',
    'cgToFrontAxle_m',
    'cgToRearAxle_m',
    'steeringRatio',
    'maxSteerAngle_rad',
    'maxSteerRate_radps',
  ] satisfies VehicleField[],
  properties: {
    $schema: { type: 'string', description: 'Optional pointer to this schema, ignored.' },
    name: { type: 'string', minLength: 1, description: 'Short name of the vehicle, shown in outputs.' },
    description: { type: 'string' },
    mass_kg: number('Total mass including payload for the tests, kg.'),
    yawInertia_kgm2: number('Yaw moment of inertia about the vertical axis through the CG, kg·m².'),
    cgToFrontAxle_m: number('Horizontal distance from the centre of gravity to the front axle, m.'),
    cgToRearAxle_m: number('Horizontal distance from the centre of gravity to the rear axle, m.'),
    steeringRatio: number('Steering-wheel angle per road-wheel angle, dimensionless (1 for by-wire road-wheel actuators).'),
    maxSteerAngle_rad: number('Largest road-wheel angle the actuator reaches, rad.'),
    maxSteerRate_radps: number('Largest road-wheel angle rate of the actuator, rad/s.'),
    actuatorLag_s: number('First-order lag of the steering actuator position loop, s.'),
    actuatorDelay_s: number('Transport delay of the steering actuator, s.'),
    controllerSampleTime_s: number('Sample time of the firmware steering controller, s.'),
    serviceAcceleration_mps2: number(
      'Acceleration the vehicle uses in service, m/s² (not the most it can do): the speed ramp through the range the scenarios judge a schedule by.',
    ),
    serviceDeceleration_mps2: number(
      'Service braking deceleration the vehicle uses, m/s² (not an emergency stop): the braking through the range the scenarios judge a schedule by.',
    ),
    frontCorneringStiffness_NPerRad: number('Nominal whole front axle cornering stiffness (simulator only), N/rad.'),
    rearCorneringStiffness_NPerRad: number('Nominal whole rear axle cornering stiffness (simulator only), N/rad.'),
  } satisfies Partial<Record<VehicleField | '$schema', unknown>>,
} as const;

/** The range one numeric field must lie in, and what to tell the user when it does not. */
export interface FieldRange {
  readonly field: VehicleField;
  /** Exclusive lower bound unless `minimumInclusive`. */
  readonly minimum: number;
  readonly minimumInclusive?: boolean;
  /** Exclusive upper bound. */
  readonly maximum?: number;
  /** Words for the expected range, e.g. "above 0 kg". */
  readonly expected: string;
  /** What to do about it. */
  readonly advice: string;
}

/** Physical ranges of the numeric fields (checked in this order). */
export const VEHICLE_RANGES: readonly FieldRange[] = [
  {
    field: 'mass_kg',
    minimum: 0,
    maximum: 1e6,
    expected: 'a mass above 0 kg and below 1,000,000 kg',
    advice: 'enter the test mass in kilograms (a sidewalk robot is tens of kg, a loaded haul truck hundreds of tonnes)',
  },
  {
    field: 'yawInertia_kgm2',
    minimum: 0,
    maximum: 1e8,
    expected: 'a yaw inertia above 0 kg·m² and below 1e8 kg·m²',
    advice: 'enter the yaw moment of inertia in kg·m² (roughly mass × wheelbase² / 4 for a first estimate)',
  },
  {
    field: 'cgToFrontAxle_m',
    minimum: 0,
    maximum: 20,
    expected: 'a distance above 0 m and below 20 m',
    advice: 'the centre of gravity must lie between the axles; measure from the CG to the front axle in metres',
  },
  {
    field: 'cgToRearAxle_m',
    minimum: 0,
    maximum: 20,
    expected: 'a distance above 0 m and below 20 m',
    advice: 'the centre of gravity must lie between the axles; measure from the CG to the rear axle in metres',
  },
  {
    field: 'steeringRatio',
    minimum: 0,
    maximum: 100,
    expected: 'a ratio above 0 and below 100',
    advice: 'use steering-wheel angle divided by road-wheel angle (1 for a road-wheel actuator)',
  },
  {
    field: 'maxSteerAngle_rad',
    minimum: 0,
    maximum: Math.PI / 2,
    expected: 'a road-wheel angle above 0 and below π/2 rad (90°)',
    advice: 'a larger value is probably degrees in a radian field or a steering-wheel angle: convert to road-wheel radians',
  },
  {
    field: 'maxSteerRate_radps',
    minimum: 0,
    maximum: 20,
    expected: 'a rate above 0 rad/s and below 20 rad/s',
    advice: 'enter the road-wheel angle rate limit in rad/s',
  },
  {
    field: 'actuatorLag_s',
    minimum: 0,
    minimumInclusive: true,
    maximum: 5,
    expected: 'a lag from 0 s to below 5 s',
    advice: 'enter the actuator time constant in seconds (0 for none)',
  },
  {
    field: 'actuatorDelay_s',
    minimum: 0,
    minimumInclusive: true,
    maximum: 1,
    expected: 'a delay from 0 s to below 1 s',
    advice: 'enter the actuator transport delay in seconds (0 for none)',
  },
  {
    field: 'controllerSampleTime_s',
    minimum: 1e-4,
    minimumInclusive: true,
    maximum: 1,
    expected: 'a sample time from 0.0001 s (10 kHz) to below 1 s',
    advice: 'enter the controller period in seconds, e.g. 0.01 for 100 Hz',
  },
  {
    field: 'serviceAcceleration_mps2',
    minimum: 0,
    maximum: 10,
    expected: 'an acceleration above 0 m/s² and below 10 m/s² (about 1 g)',
    advice: 'enter the acceleration the vehicle uses in service in m/s² (1 m/s² ≈ 0.1 g)',
  },
  {
    field: 'serviceDeceleration_mps2',
    minimum: 0,
    maximum: 10,
    expected: 'a deceleration above 0 m/s² and below 10 m/s² (about 1 g), as a positive number',
    advice: 'enter the service braking deceleration in m/s², positive (2 m/s² ≈ 0.2 g, firm braking on a road)',
  },
  {
    field: 'frontCorneringStiffness_NPerRad',
    minimum: 0,
    expected: 'a stiffness above 0 N/rad',
    advice: 'enter the whole-axle cornering stiffness in N/rad (ISO 8855 sign: positive)',
  },
  {
    field: 'rearCorneringStiffness_NPerRad',
    minimum: 0,
    expected: 'a stiffness above 0 N/rad',
    advice: 'enter the whole-axle cornering stiffness in N/rad (ISO 8855 sign: positive)',
  },
];
