import type { SignalRule } from '../engine/types';

/** Short tag drawn beside a flagged point. */
export function ruleTag(rule: SignalRule): string {
  if (rule === 'ewma' || rule === 'cusum') return rule.toUpperCase();
  return rule.startsWith('we') ? `WE${rule.slice(2)}` : `N${rule.slice(1)}`;
}

/** The rule's published name, for the prompt and the history. */
export function ruleName(rule: SignalRule): string {
  if (rule === 'ewma') return 'EWMA beyond its limit';
  if (rule === 'cusum') return 'CUSUM beyond its decision interval';
  return rule.startsWith('we') ? `Western Electric rule ${rule.slice(2)}` : `Nelson test ${rule.slice(1)}`;
}
