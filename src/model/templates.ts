/** Starting figures when a person switches the sensor model (taken from the demos, our own scenarios). */
import type { Design, SensorType } from './design.js';
import { DEMOS } from './demos.js';

const FROM: Record<SensorType, string> = {
  'hall-gap-core': 'bench-clamp',
  'current-transformer': 'appliance-ct',
  'voltage-output': 'generic-sensor',
  shunt: 'generic-sensor',
  'closed-loop-hall': 'closed-loop-clamp',
};

/** The design with its sensor replaced by a starting sensor of `type`; the rest is kept. */
export function sensorTemplate(design: Design, type: SensorType): Record<string, unknown> {
  if (design.sensor.type === type) return design as unknown as Record<string, unknown>;
  const demo = DEMOS.find((d) => d.id === FROM[type])!.document as Record<string, any>;
  const sensor = type === 'shunt'
    ? { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 1 }
    : structuredClone(demo.sensor);
  const target = { ...design.target };
  if (type === 'current-transformer') target.signal = 'ac-rms';
  return { ...design, sensor, target } as unknown as Record<string, unknown>;
}
