/**
 * Every limit on what a person writes, defined once: the API's input schemas refuse more, the proof's schema
 * accepts exactly as much, and the proof's layout flows whatever fits within them onto as many pages as it takes.
 * Plain data, imported by the HTTP layer and by the renderer alike.
 */
export const LIMITS = {
  /** Characters. */
  text: {
    complaint: 4000,
    cause: 4000,
    correction: 4000,
    readingNote: 2000,
    statusReason: 2000,
    repairAction: 500,
    repairLocation: 300,
    repairNote: 2000,
    partName: 120,
    partNumber: 60,
    reviewComment: 2000,
    codesAfterNote: 500,
    vehicleMake: 60,
    vehicleModel: 60,
    vehicleEngine: 80,
    orderNumber: 20,
    circuitLabel: 80,
    circuitSensor: 64,
    referenceGroupNote: 500,
    personName: 120,
    shopName: 200,
    shopAddressLine: 200,
  },
  /** Counts. */
  count: {
    codes: 50,
    partsPerRepair: 30,
  },
  /** Numbers. */
  number: {
    partQuantity: 999,
    odometer: 3_000_000,
    labourMinutes: 24 * 60,
    keyCycles: 50,
  },
} as const;
