/** Plain-language explanations of what each rule saw. */
import type { RuleCode } from './types';

type Side = 'above' | 'below';

const sideWord = (side: Side): string => (side === 'above' ? 'above' : 'below');

const cache = new Map<string, string>();

/** The explanation for a rule and side (memoised: signals are frequent and the texts are few). */
export function explainRule(rule: RuleCode, side: Side | undefined): string {
  const key = side ? rule + side : rule;
  let text = cache.get(key);
  if (text === undefined) {
    text = compose(rule, side);
    cache.set(key, text);
  }
  return text;
}

function compose(rule: RuleCode, side: Side | undefined): string {
  const s = side ? sideWord(side) : '';
  switch (rule) {
    case 'we1':
    case 'n1':
      return `1 point ${s} the ${side === 'above' ? 'upper' : 'lower'} control limit`;
    case 'we2':
    case 'n5':
      return `2 of 3 points in a row more than 2 sigma ${s} the centre line`;
    case 'we3':
    case 'n6':
      return `4 of 5 points in a row more than 1 sigma ${s} the centre line`;
    case 'we4':
      return `8 points in a row ${s} the centre line`;
    case 'n2':
      return `9 points in a row ${s} the centre line`;
    case 'n3':
      return `6 points in a row steadily ${side === 'above' ? 'increasing' : 'decreasing'}`;
    case 'n4':
      return '14 points in a row alternating up and down';
    case 'n7':
      return '15 points in a row within 1 sigma of the centre line';
    case 'n8':
      return '8 points in a row more than 1 sigma from the centre line, on both sides';
  }
}

/** E.g. "The moving range is above its upper control limit". */
export function explainCompanion(name: string, side: Side): string {
  return `The ${name} is ${side} its ${side === 'above' ? 'upper' : 'lower'} control limit`;
}
