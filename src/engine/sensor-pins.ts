/**
 * Leads on the sensor's own pins (`location: sensor_pins`): the sensor unplugged and alone, no harness, no module.
 * Nothing powers it there, so only its resistance between two of its pins means something: ohms, both leads on
 * pins, no jumper. One rule set, read by the request schema (zod) and by the circuit model's validator.
 */

/** The fields the rules read. */
export interface SensorPinsShape {
  quantity: string;
  at: string;
  against?: string;
  location: string;
  connector: string;
  againstLocation?: string;
  jumpers: readonly unknown[];
}

export interface SensorPinsProblem {
  code: string;
  /** The request field at fault. */
  field: 'quantity' | 'connector' | 'againstLocation' | 'at' | 'against' | 'jumpers';
  message: string;
}

/** The pins a sensor can have (its wire roles); battery posts and chassis are not on the sensor. */
const PIN_POINTS: readonly string[] = ['reference', 'signal', 'ground'];

/** What is wrong with a request's use of the sensor's pins (empty when it is fine or does not use them). */
export function sensorPinsProblems(r: SensorPinsShape): SensorPinsProblem[] {
  const out: SensorPinsProblem[] = [];
  const onPins = r.location === 'sensor_pins';
  if (r.againstLocation === 'sensor_pins' && !onPins)
    out.push({ code: 'request.sensor_pins_far_lead', field: 'againstLocation', message: "a lead on the sensor's own pins needs both there: set location sensor_pins and leave againstLocation out" });
  if (!onPins) return out;
  if (r.quantity !== 'ohms')
    out.push({ code: 'request.sensor_pins_not_ohms', field: 'quantity', message: `on the sensor's own pins (sensor unplugged, nothing powers it) only ohms means something, got ${r.quantity}` });
  if (r.connector !== 'unplugged')
    out.push({ code: 'request.sensor_pins_plugged', field: 'connector', message: `leads on the sensor's own pins need the sensor unplugged: connector unplugged, got ${r.connector}` });
  if (r.againstLocation !== undefined && r.againstLocation !== 'sensor_pins')
    out.push({ code: 'request.sensor_pins_far_lead', field: 'againstLocation', message: "both leads go on the sensor's own pins: leave againstLocation out" });
  for (const field of ['at', 'against'] as const) {
    const point = r[field];
    if (point !== undefined && !PIN_POINTS.includes(point))
      out.push({ code: 'request.sensor_pins_point', field, message: `on the sensor's own pins a lead goes on its reference, signal or ground pin, got ${point}` });
  }
  if (Array.isArray(r.jumpers) && r.jumpers.length > 0)
    out.push({ code: 'request.sensor_pins_jumper', field: 'jumpers', message: 'no jumper on the pins of an unplugged sensor: leave jumpers empty' });
  return out;
}
