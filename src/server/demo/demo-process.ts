/**
 * How each demo characteristic's process behaves: its mean and spread, and the designed events
 * (a sustained shift, a slow trend, one outlier, a late burst) that the charts should catch.
 * Invented numbers for the demo only.
 */

export interface ProcessModel {
  readonly mean: number;
  readonly sigma: number;
  /** Designed change of the mean at subgroup i (before the closed loop cuts it off). */
  readonly effect?: { readonly from: number; readonly at: (i: number) => number; readonly story: Story };
}

export interface Story {
  readonly whatHappened: string;
  readonly causeCategory: string;
  readonly cause: string;
  readonly action: string;
}

export const MODELS: Readonly<Record<string, ProcessModel>> = {
  // A sustained shift: the mean steps up after an insert change and stays there until the chart catches it.
  'bore-dia': {
    mean: 25.0,
    sigma: 0.004,
    effect: {
      from: 310,
      at: () => 0.0026,
      story: {
        whatHappened: 'Bore means ran above the centre line from the night shift on, after the boring insert was changed.',
        causeCategory: 'Machine',
        cause: 'New insert seated proud in its pocket',
        action: 'Re-seated the insert and corrected the tool offset by -0.003 mm; parts since the insert change re-measured, all in tolerance.',
      },
    },
  },
  'bonnet-torque': { mean: 25.0, sigma: 0.6 },
  // A slow trend: the fill weight creeps up as the dosing nozzle clogs.
  'fill-weight': {
    mean: 502.0,
    sigma: 0.8,
    effect: {
      from: 150,
      at: (i) => 0.012 * (i - 150),
      story: {
        whatHappened: 'Fill weight crept upward over more than a day; no single subgroup looked wrong.',
        causeCategory: 'Machine',
        cause: 'Dosing nozzle partly blocked by cured sealant; the pump stroke had been lengthened to compensate',
        action: 'Inspected and cleaned the dosing nozzle, reset the dose volume to the standard setting and recorded it.',
      },
    },
  },
  // A small sustained drift of the viscosity after a new drum: about 0.8 sigma, the kind EWMA is for.
  'sealant-viscosity': {
    mean: 42.0,
    sigma: 0.9,
    effect: {
      from: 150,
      at: () => 0.75,
      story: {
        whatHappened: 'Viscosity readings drifted slightly high after the drum change; each reading was within the usual spread.',
        causeCategory: 'Material',
        cause: 'New drum from a different batch, stiffer than the last',
        action: 'Checked the drum batch against the shift sheet and raised the drum heater by 2 °C on the engineer\'s instruction.',
      },
    },
  },
  // A one-sigma fall of the oven temperature when a burner nozzle partly clogged: CUSUM catches it.
  'cure-temp': {
    mean: 180.0,
    sigma: 0.7,
    effect: {
      from: 330,
      at: () => -0.8,
      story: {
        whatHappened: 'Oven temperature ran a little low for several hours; no single reading was out of the ordinary.',
        causeCategory: 'Machine',
        cause: 'Burner nozzle partly clogged',
        action: 'Compared the display with the reference thermocouple, cleaned the burner nozzle; held panels released by the engineer after a cure test.',
      },
    },
  },
  'coating-blemish': { mean: 3.2, sigma: 0 },
  'leak-fail': { mean: 0.04, sigma: 0 },
};

/** One outlier: a single torque reading far above the rest. */
export const TORQUE_OUTLIER = {
  index: 200,
  value: 27.8,
  story: {
    whatHappened: 'One bonnet read 27.8 N·m, far above every other reading of the day.',
    causeCategory: 'Machine',
    cause: 'Nutrunner clutch slipped and the spindle hit the bolt twice',
    action: 'Stopped the station, checked the nutrunner on the torque analyser, re-torqued the two held assemblies and replaced the clutch spring.',
  },
};

/** A burst of blemishes in the last hours, left open for the demo. */
export const BLEMISH_BURST = { hoursBeforeEnd: 3, count: 14 };
