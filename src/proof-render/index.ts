/** Proof-of-repair PDF: view model in, PDF bytes out; plus the evidence digest that the PDF prints. */
export type {
  Circuit, DiagnosticStep, ExpectedRange, ForemanDecision, Outcome, Part, PaperSize, Person, ProofView, Reading,
  RenderOptions, RepairAction, RepairOrderHead, Candidate, CircuitCause, CodesAfterRepair, CodeCheckMethod, Shop, SignOff, SupersededReading, TroubleCode, Vehicle,
  VerificationCheck, VinCheck, CautionCode,
} from './view';
export { CAUTION_CODES, CODE_CHECK_METHODS, PAPER_SIZES, PROOF_FORMAT, VIN_CHECKS } from './view';
export { renderProof, renderProofDetailed, tryRenderProof, type RenderedProof, type RenderOutcome } from './render';
export { validateProofView, requiredCautions, inRange, type ValidationResult } from './validate';
export { canonicalJson, evidenceDigest, parseDigest, proofDigest, publicProofUrl, qrPayload, sha256Hex, verifyProofDigest, QR_PREFIX, type DigestCheck } from './digest';
export { ProofViewError, type Finding } from './findings';
export { CAUTION_TEXT } from './sections-close';
export { formatProbability } from './format';
