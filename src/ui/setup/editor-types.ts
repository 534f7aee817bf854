import type { CharacteristicField } from '../../app/characteristic-form';
import type { FieldErrors as Errors } from '../../app/form-issues';

export type { ChartType } from '../../schema';
export type FieldErrors = Errors<CharacteristicField>;
