import { DEFAULT_CAUSE_CATEGORIES, type Characteristic, type Person, type SetupRecord } from '../../schema/index';

/**
 * The demo scenario's set-up: an invented plant with invented people and numbers.
 * Nothing here describes a real company or product.
 */
export const DEMO_SITE_ID = 'ashcombe-b3';
export const DEMO_SITE_NAME = 'Ashcombe Fluid Fittings, Bay 3';
/** The device id the demo history is recorded from. */
export const DEMO_DEVICE_ID = 'dev-demo-history';
export const DEMO_HISTORY_DAYS = 21;

export interface DemoPerson extends Person {
  readonly pin: string;
}

export const DEMO_PEOPLE: readonly DemoPerson[] = [
  { id: 'p-rana', name: 'Rana Okafor', login: 'rana', role: 'operator', active: true, pin: '2468' },
  { id: 'p-tomasz', name: 'Tomasz Wilk', login: 'tomasz', role: 'supervisor', active: true, pin: '1357' },
  { id: 'p-imogen', name: 'Imogen Hale', login: 'imogen', role: 'engineer', active: true, pin: '8642' },
  { id: 'p-marguerite', name: 'Marguerite Osei', login: 'marguerite', role: 'admin', active: true, pin: '9753' },
];

const causes = [...DEFAULT_CAUSE_CATEGORIES];

export const DEMO_CHARACTERISTICS: readonly Characteristic[] = [
  {
    id: 'bore-dia',
    stationId: 'st-turning',
    name: 'Seat bore diameter',
    unit: 'mm',
    decimals: 3,
    chartType: 'xbar-r',
    subgroupSize: 5,
    intervalMinutes: 60,
    spec: { lsl: 24.985, usl: 25.015, target: 25.0 },
    rules: ['we1', 'we2', 'we3', 'we4'],
    reactionPlan: [
      'Re-measure the last part on the bench bore gauge.',
      'Check the boring insert for wear or a chipped edge; change it if in doubt.',
      'Correct the tool offset by the measured deviation from 25.000 mm.',
      'Quarantine the parts made since the last good sample and tell the setter.',
    ],
    causeCategories: causes,
    safetyCritical: false,
    baselineSize: 25,
  },
  {
    id: 'bonnet-torque',
    stationId: 'st-assembly',
    name: 'Bonnet bolt torque',
    unit: 'N·m',
    decimals: 1,
    chartType: 'xmr',
    subgroupSize: 1,
    intervalMinutes: 60,
    spec: { lsl: 22.0, usl: 28.0, target: 25.0 },
    rules: ['n1', 'n2', 'n3', 'n5', 'n6'],
    reactionPlan: [
      'Stop the station and hold the last assembly.',
      'Check the nutrunner against the torque analyser.',
      'Re-torque or scrap the held assemblies as the engineer decides.',
      'Record the analyser reading and restart only after a good check.',
    ],
    causeCategories: causes,
    safetyCritical: true,
    baselineSize: 25,
  },
  {
    id: 'fill-weight',
    stationId: 'st-filling',
    name: 'Cartridge fill weight',
    unit: 'g',
    decimals: 1,
    chartType: 'xbar-s',
    subgroupSize: 4,
    intervalMinutes: 60,
    spec: { lsl: 499.0, usl: 505.0, target: 502.0 },
    rules: ['n1', 'n2', 'n3', 'n5', 'n6'],
    reactionPlan: [
      'Weigh four more cartridges from the same head.',
      'Check the sealant temperature at the filler inlet.',
      'Inspect and clean the dosing nozzle.',
      'Adjust the dose volume and record the new setting.',
    ],
    causeCategories: causes,
    safetyCritical: false,
    baselineSize: 25,
  },
  {
    id: 'coating-blemish',
    stationId: 'st-finish',
    name: 'Coating blemishes per panel',
    unit: 'blemishes',
    decimals: 0,
    chartType: 'c',
    subgroupSize: 1,
    intervalMinutes: 60,
    spec: { usl: 10 },
    rules: ['we1'],
    reactionPlan: [
      'Inspect the next panel under the daylight lamp.',
      'Check the spray gun tip and the booth filter.',
      'Check the surface cleaning step before the booth.',
    ],
    causeCategories: causes,
    safetyCritical: false,
    baselineSize: 25,
  },
  {
    id: 'leak-fail',
    stationId: 'st-finish',
    name: 'Leak test failures',
    unit: 'defectives',
    decimals: 0,
    chartType: 'p',
    subgroupSize: 100,
    intervalMinutes: 480,
    spec: { usl: 0.08 },
    rules: ['we1', 'we2'],
    reactionPlan: [
      'Re-test three failed parts to rule out the tester.',
      'Check the test seals and the calibration leak.',
      'Inspect failed parts for porosity or a damaged seat.',
      'Hold the shift lot if failures stay above the limit.',
    ],
    causeCategories: causes,
    safetyCritical: false,
    baselineSize: 20,
  },
  {
    // EWMA for a small sustained drift that a Shewhart chart would take long to see.
    id: 'sealant-viscosity',
    stationId: 'st-filling',
    name: 'Sealant viscosity at the filler',
    unit: 'Pa·s',
    decimals: 1,
    chartType: 'ewma',
    subgroupSize: 1,
    intervalMinutes: 120,
    spec: { lsl: 38.0, usl: 46.0, target: 42.0 },
    rules: [],
    reactionPlan: [
      'Read the drum batch number and check it against the shift sheet.',
      'Check the sealant temperature at the drum heater.',
      'Take a cup sample to the lab for a second reading.',
      'Ask the engineer before changing the heater setting.',
    ],
    causeCategories: causes,
    safetyCritical: false,
    baselineSize: 25,
    ewma: { lambda: 0.2, L: 2.962 },
  },
  {
    // Tabular CUSUM on the oven temperature, read once an hour.
    id: 'cure-temp',
    stationId: 'st-finish',
    name: 'Cure oven temperature',
    unit: '°C',
    decimals: 1,
    chartType: 'cusum',
    subgroupSize: 1,
    intervalMinutes: 60,
    spec: { lsl: 176.0, usl: 184.0, target: 180.0 },
    rules: [],
    reactionPlan: [
      'Compare the oven display with the reference thermocouple.',
      'Check the burner and the air circulation fan.',
      'Hold the panels cured since the shift began until the engineer decides.',
    ],
    causeCategories: causes,
    safetyCritical: false,
    baselineSize: 25,
    cusum: { k: 0.5, h: 5 },
  },
];

/** Characteristics whose first phase uses limits given from an earlier study rather than a baseline. */
export const DEMO_GIVEN_LIMITS: Readonly<Record<string, { centre: number; sigma: number }>> = {
  'cure-temp': { centre: 180.0, sigma: 0.7 },
};

/** The demo set-up as log entries, parents before children; phases start with the history. */
export function demoSetupRecords(historyStart: Date): SetupRecord[] {
  const site = DEMO_SITE_ID;
  return [
    { kind: 'site', id: site, body: { id: site, name: DEMO_SITE_NAME } },
    { kind: 'line', id: 'line-valves', body: { id: 'line-valves', siteId: site, name: 'Line 1 – Valve bodies' } },
    { kind: 'line', id: 'line-fill', body: { id: 'line-fill', siteId: site, name: 'Line 2 – Sealant fill and finish' } },
    { kind: 'station', id: 'st-turning', body: { id: 'st-turning', lineId: 'line-valves', name: 'Turning cell T4' } },
    { kind: 'station', id: 'st-assembly', body: { id: 'st-assembly', lineId: 'line-valves', name: 'Bonnet assembly' } },
    { kind: 'station', id: 'st-filling', body: { id: 'st-filling', lineId: 'line-fill', name: 'Cartridge filler F2' } },
    { kind: 'station', id: 'st-finish', body: { id: 'st-finish', lineId: 'line-fill', name: 'Coating and leak test' } },
    ...DEMO_CHARACTERISTICS.map((c): SetupRecord => ({ kind: 'characteristic', id: c.id, body: c })),
    ...DEMO_CHARACTERISTICS.map((c): SetupRecord => ({
      kind: 'phase',
      id: demoPhaseId(c.id),
      body: {
        id: demoPhaseId(c.id), characteristicId: c.id, number: 1, startsAt: historyStart.toISOString(),
        ...(DEMO_GIVEN_LIMITS[c.id]
          ? { reason: 'Limits carried over from the oven qualification study.', given: DEMO_GIVEN_LIMITS[c.id]! }
          : { reason: 'First study after the station was commissioned.' }),
      },
    })),
    ...DEMO_PEOPLE.map(({ pin: _pin, ...person }): SetupRecord => ({ kind: 'person', id: person.id, body: person })),
    { kind: 'causes', id: `${site}-causes`, body: { siteId: site, categories: causes } },
  ];
}

export function demoPhaseId(characteristicId: string): string {
  return `${characteristicId}-ph1`;
}
