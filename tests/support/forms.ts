/**
 * The meter form as a browser posts it: every field present, optional ones
 * empty. Tests pass only what their case is about.
 */
export function meterFormFields(
  fields: Record<string, string> & { code: string },
): Record<string, string> {
  return {
    intent: "save-meter",
    name: `Meter ${fields.code}`,
    quantity: "electric_register",
    carrier: "electricity",
    orientation: "import",
    parentMeterId: "",
    position: "boundary",
    serial: "",
    multiplier: "",
    rolloverKwh: "",
    sensorAt: "",
    defaultPressureBarAbs: "",
    spikeFactor: "",
    accuracyClass: "",
    deltaThetaMinK: "",
    qpM3PerH: "",
    installedAt: "2024-01-01",
    ...fields,
  };
}
