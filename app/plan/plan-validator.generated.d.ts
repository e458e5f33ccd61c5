// Types of plan-validator.generated.js (written by scripts/gen-validator.ts; this file by hand).
import type { ErrorObject } from 'ajv';

/** ajv's precompiled check of plan.schema.json (allErrors, verbose); errors of the last call. */
export interface PlanSchemaCheck {
  (data: unknown): boolean;
  errors?: ErrorObject[] | null;
}

export declare const validate: PlanSchemaCheck;
export default validate;
