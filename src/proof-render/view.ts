/**
 * The proof-of-repair view model: everything the PDF states, as plain JSON (strings, numbers, booleans, arrays,
 * null). The service layer builds it from a repair order; the renderer prints it; the evidence digest is the
 * SHA-256 of its RFC 8785 canonical form, so a verifier can recompute it from the same JSON.
 *
 * Times are ISO 8601 strings with an explicit offset ("2025-03-14T09:42:00+01:00" or "...Z"); the document prints
 * them in the offset they carry, so the same view prints the same text on every server.
 */
import type { CircuitUnderTestKind, MeasurementRequest } from '../engine/vocabulary';

/** Version tag of this view shape; part of the digested data, so a later shape can never collide with this one. */
export const PROOF_FORMAT = 'tracebay.proof/2' as const;

export interface ProofView {
  /** Always `PROOF_FORMAT`. */
  format: typeof PROOF_FORMAT;
  shop: Shop;
  repairOrder: RepairOrderHead;
  /** Technician who diagnosed and repaired; null when nobody has acted as one on the order. */
  technician: Person | null;
  /** Foreman whose decision is the latest; null while no foreman has decided anything (nobody is named then). */
  foreman: Person | null;
  vehicle: Vehicle;
  /** The three Cs, as written on the repair order (free text, may be long; wraps). */
  concern: { complaint: string; cause: string; correction: string };
  troubleCodes: { found: TroubleCode[]; afterRepair: CodesAfterRepair };
  /** The sensor circuits the work touched; diagnostic steps and verification checks refer to them by `id`. */
  circuits: Circuit[];
  /** The diagnostic path in the order the tests were taken (`seq` strictly increasing). */
  diagnosis: DiagnosticStep[];
  /** Per circuit diagnosed: the cause the engine proved, or "not proven" with the leading candidates. */
  causes: CircuitCause[];
  /** What was done, in order; empty prints "no repair recorded". */
  repairs: RepairAction[];
  /** Tests repeated after the repair; empty prints "not verified". */
  verification: VerificationCheck[];
  signOff: SignOff;
  /** Which safety cautions apply to the work done (each printed once, in a fixed order). */
  cautions: CautionCode[];
}

export interface Shop {
  name: string;
  /** Postal address, one line per entry (0–4 lines). */
  addressLines: string[];
  /** IANA name of the zone every time on the document is printed in, e.g. "Europe/Berlin". */
  timeZone: string;
  /** Optional phone number, printed as given. */
  phone?: string;
}

export interface RepairOrderHead {
  /** The shop's repair order number, printed as given. */
  number: string;
  openedAt: string;
  /** When the repair was finished; null while not repaired. */
  repairedAt: string | null;
  /** When the verification readings were completed; null while not verified. */
  verifiedAt: string | null;
}

export interface Person {
  name: string;
  /** Optional shop-internal staff number or certification id, printed after the name. */
  id?: string;
}

/** `valid`: the 49 CFR 565 check digit matches. `not_checked_outside_na`: built outside North America, where the
 * ninth character need not be a check digit. `invalid`: the check digit does not match (printed as a warning). */
export const VIN_CHECKS = ['valid', 'invalid', 'not_checked_outside_na'] as const;
export type VinCheck = (typeof VIN_CHECKS)[number];

export interface Vehicle {
  /** 17 characters, upper case, no I, O or Q. */
  vin: string;
  vinCheck: VinCheck;
  year: number;
  make: string;
  model: string;
  /** Engine description, e.g. "2.0 L I4 gasoline". */
  engine: string;
  /** Odometer when the vehicle came in, and when it left (null while not recorded). */
  odometer: { in: number; out: number | null; unit: 'km' | 'mi' };
}

/** How the codes after the repair were read: cleared and read again after key cycles, a road test, or a re-scan. */
export const CODE_CHECK_METHODS = ['cleared_then_key_cycles', 'road_test', 'rescanned'] as const;
export type CodeCheckMethod = (typeof CODE_CHECK_METHODS)[number];

export interface CodesAfterRepair {
  /** Null while nobody recorded a read of the codes after the repair: then nothing is claimed about them. */
  check: { method: CodeCheckMethod; keyCycles: number | null; checkedAt: string; note?: string } | null;
  codes: TroubleCode[];
}

export const DTC_STATUSES = ['current', 'pending', 'history'] as const;
export type DtcStatus = (typeof DTC_STATUSES)[number];

export interface TroubleCode {
  /** SAE J2012 form: P, C, B or U, a digit 0–3, three hex digits (e.g. "P0122"). */
  code: string;
  description: string;
  status: DtcStatus;
}

export interface Circuit {
  /** Stable id referenced by steps and checks. */
  id: string;
  /** Printed name, e.g. "Throttle position sensor 1". */
  name: string;
  kind: CircuitUnderTestKind;
}

/**
 * A reading as the technician entered it plus its value in the coherent SI unit. `value` and `si` are null when
 * the meter showed over-range ("OL"), in which case `entered` says so.
 */
export interface Reading {
  /** Exactly as entered and printed, e.g. "4.87 V", "253 kΩ", "OL". */
  entered: string;
  /** The number of `entered`, in `unit` (4.87, 253), or null for over-range. */
  value: number | null;
  /** The unit of `entered`: "V", "mV", "kΩ", "°C", "%", "kPa", "rpm" … */
  unit: string;
  /** The same value in `siUnit` (253 kΩ → 253000), or null for over-range. */
  si: number | null;
  /** "V", "Ω", "A", "Pa", "K", or the display unit itself when it has no SI form ("%", "rpm", "°C"). */
  siUnit: string;
}

/** What a good circuit reads for this test. A missing bound means open-ended ("≤ 0.1 V"). `unit` is that of the
 * bounds as printed; it must convert to the reading's `siUnit`. */
export interface ExpectedRange {
  min: number | null;
  max: number | null;
  unit: string;
}

export interface Outcome {
  /** The engine's outcome code, e.g. "reference_ok", "signal_pulled_high". */
  code: string;
  /** Printed label, e.g. "Reference present and steady". */
  label: string;
}

/** A reading that was later corrected. It stays in the proof, struck through, with who corrected it and why. */
export interface SupersededReading {
  reading: Reading;
  takenAt: string;
  takenBy: string;
  correctedAt: string;
  correctedBy: string;
  reason: string;
}

export interface DiagnosticStep {
  id: string;
  /** Position on the diagnostic path, 1-based, strictly increasing through the array. */
  seq: number;
  circuitId: string;
  /** Short name of the test, e.g. "Signal voltage, connector unplugged". */
  title: string;
  /** Where the leads went and the vehicle state (the shared measurement vocabulary). */
  request: MeasurementRequest;
  /** The reading in force. */
  reading: Reading;
  /** What a healthy circuit reads on this test; null when the tree sets no band for it (printed as such). */
  expected: ExpectedRange | null;
  outcome: Outcome;
  takenAt: string;
  takenBy: string;
  /** Earlier entries for this test that the current reading replaced, oldest first. */
  superseded: SupersededReading[];
  /** Optional free note (wraps). */
  note?: string;
}

export interface Candidate {
  /** The engine's hypothesis code, e.g. "signal_open". */
  code: string;
  /** Printed statement, e.g. "Open in the signal wire between sensor and module". */
  label: string;
  /** Posterior probability from the engine, 0–1. */
  probability: number;
}

/**
 * What the diagnosis of one circuit established. `proven`: the engine reached its threshold and `cause` is the root
 * cause; otherwise `cause` is null and the document prints "not proven" with the `leading` candidates.
 */
export interface CircuitCause {
  circuitId: string;
  proven: boolean;
  cause: Candidate | null;
  leading: Candidate[];
  /** Ids of the diagnostic steps whose readings decided it (empty when not proven). */
  decidingStepIds: string[];
  /** What to do instead of a repair (nothing proven, or no fault found now). */
  advice?: string;
}

export interface Part {
  /** Part number as on the invoice, if any. */
  number?: string;
  description: string;
  quantity: number;
}

export interface RepairAction {
  /** The circuit repaired, or null for a repair not on one circuit. */
  circuitId: string | null;
  /** Labour: clock-on and clock-off, and the minutes (as entered, or between the two). */
  labour: { clockOnAt: string | null; clockOffAt: string | null; minutes: number | null };
  /** What was done, e.g. "Spliced signal wire with solder and heat-shrink sleeve". */
  action: string;
  /** Where on the circuit, e.g. "Signal wire, 12 cm from the sensor connector". */
  location: string;
  parts: Part[];
  by: string;
  at: string;
  note?: string;
}

export interface VerificationCheck {
  id: string;
  /** Position in the verification, 1-based, strictly increasing through the array. */
  seq: number;
  circuitId: string;
  /** The diagnostic step this check repeats; null for an after-repair reading that repeats none. */
  repeatsStepId: string | null;
  title: string;
  request: MeasurementRequest;
  /** The reading before the repair (the repeated step's reading); null when it repeats none. */
  before: Reading | null;
  /** The reading after the repair. */
  after: Reading;
  /** Where the healthy circuit reads; null when the test has no band. */
  expected: ExpectedRange | null;
  /** Whether `after` lies in `expected` (validated against the numbers); null without a band. */
  pass: boolean | null;
  /** It repeats a reading that decided the cause: this check is what proves the fix. */
  provesFix: boolean;
  takenAt: string;
  takenBy: string;
  /** Earlier after-repair entries that `after` replaced, oldest first. */
  superseded: SupersededReading[];
  note?: string;
}

/** `withdrawn`: an earlier approval taken back (with a comment); the proof is then not approved. */
export const DECISIONS = ['approved', 'returned', 'withdrawn'] as const;
export type Decision = (typeof DECISIONS)[number];

export interface ForemanDecision {
  decision: Decision;
  by: string;
  at: string;
  /** Required when returned or withdrawn; optional when approved. */
  comment?: string;
  /** SHA-256 of the evidence (this document's statements without the sign-off) the decision was taken on. */
  evidenceDigest?: string;
}

export interface SignOff {
  technicianSignedAt: string | null;
  foremanSignedAt: string | null;
  /** Every foreman decision, oldest first; the last one is the one in force. */
  decisions: ForemanDecision[];
}

/** Safety cautions the document can carry. Which apply is the caller's call; `requiredCautions` derives the ones
 * the readings themselves imply. */
export const CAUTION_CODES = [
  'engine_in_bay',
  'fused_jumpers_only',
  'no_ohmmeter_on_airbag',
  'high_voltage_system',
  'backprobe_gently',
] as const;
export type CautionCode = (typeof CAUTION_CODES)[number];

/** Rendering choices that are not part of the evidence (they change no statement, so they are not digested). */
export interface RenderOptions {
  /** Paper size; default A4. */
  paper?: PaperSize;
  /** Address of the issuing service (e.g. "https://bay.example.org"): the QR code and the printed line point at
   * `<publicBase>/proofs/<digest>`, where anyone can check the document without signing in. */
  publicBase?: string;
}
export const PAPER_SIZES = ['A4', 'LETTER'] as const;
export type PaperSize = (typeof PAPER_SIZES)[number];
