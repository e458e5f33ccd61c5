// Checks of the sky and the field: the declination model's validity and daylight (civil twilight).
import { civilTwilight, sunElevationDeg, WMM_VALIDITY } from '../model';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import { type CheckResult, r1, usedVariants } from './check-result';

export function magneticCheck(plan: Plan, result: PlanResult): CheckResult {
  const fixed = usedVariants(plan, result).some((v) => v.guidance === 'fixed-heading');
  const t = new Date(plan.time).getTime();
  const ok = t >= Date.parse(WMM_VALIDITY.validFrom) && t <= Date.parse(WMM_VALIDITY.validTo);
  return {
    id: 'magnetic-model',
    title: 'Magnetic model valid for the plan time',
    status: !fixed ? 'n/a' : ok ? 'pass' : 'fail',
    why: !fixed
      ? 'No fixed-heading variant is used.'
      : ok
        ? `${plan.time} is within ${WMM_VALIDITY.model} validity.`
        : `${plan.time} is outside ${WMM_VALIDITY.model} validity: magnetic headings cannot be given.`,
    numbers: {
      time: plan.time,
      model: WMM_VALIDITY.model,
      validFrom: WMM_VALIDITY.validFrom,
      validTo: WMM_VALIDITY.validTo,
    },
  };
}

export function daylightCheck(plan: Plan, result: PlanResult): CheckResult {
  const when = new Date(plan.time);
  const { lat, lon } = result.releasePoint;
  const tw = civilTwilight(when, lat, lon);
  const t = when.getTime();
  const ok =
    tw.polar === 'day' ||
    (tw.dawn !== null && tw.dusk !== null && t >= tw.dawn.getTime() && t <= tw.dusk.getTime());
  return {
    id: 'daylight',
    title: 'Between civil dawn and dusk',
    status: ok ? 'pass' : 'fail',
    why:
      (ok
        ? 'The plan time is between civil dawn and civil dusk at the release point.'
        : 'The plan time is outside civil twilight (sun more than 6° below the horizon).') +
      ' Night rules differ by country; an override records any authorisation.',
    numbers: {
      dawn:
        tw.dawn?.toISOString() ?? (tw.polar === 'day' ? 'none (polar day)' : 'none (polar night)'),
      dusk:
        tw.dusk?.toISOString() ?? (tw.polar === 'day' ? 'none (polar day)' : 'none (polar night)'),
      sunElevation_deg: r1(sunElevationDeg(when, lat, lon)),
    },
  };
}
