import type { ChartType } from '../../schema';

/** Short chart names for lists and headings. */
export const CHART_SHORT_NAME: Readonly<Record<ChartType, string>> = {
  xmr: 'XmR', 'xbar-r': 'X̄-R', 'xbar-s': 'X̄-s', p: 'p chart', np: 'np chart', c: 'c chart', u: 'u chart', ewma: 'EWMA', cusum: 'CUSUM',
};
