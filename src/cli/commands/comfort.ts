import type { Command } from '../command.ts';
import { InputError } from '../../physics/errors.ts';
import { utciC, utciStressCategory, UTCI_CATEGORIES } from '../../physics/utci.ts';

export const comfortCommand: Command = {
  name: 'comfort',
  summary: 'UTCI and its heat/cold stress category from air temperature, MRT, 10 m wind and humidity',
  usage: 'sunfacet comfort --ta <°C> --tmrt <°C> --wind <m/s at 10 m> --rh <%> [--json]',
  options: {
    ta: { type: 'number', min: -50, max: 50, unit: '°C', required: true, value: '<°C>', help: 'air temperature' },
    tmrt: { type: 'number', min: -80, max: 120, unit: '°C', required: true, value: '<°C>', help: 'mean radiant temperature' },
    wind: { type: 'number', min: 0.5, max: 17, unit: 'm/s', required: true, value: '<m/s>', help: 'wind speed at 10 m height' },
    rh: { type: 'number', min: 0, max: 100, unit: '%', required: true, value: '<%>', help: 'relative humidity' },
    json: { type: 'boolean', help: 'print {utciC, category} as JSON' },
  },
  details:
    'UTCI by the operational polynomial of Bröde et al. 2012 (Int J Biometeorol 56:481–494). Valid for\n' +
    '−50 < Ta < 50 °C, −30 < Tmrt − Ta < 70 K and wind 0.5–17 m/s at 10 m; inputs outside are refused.',
  async run({ options }, io) {
    const ta = options.ta as number, tmrt = options.tmrt as number;
    const d = tmrt - ta;
    if (!(d > -30 && d < 70)) {
      throw new InputError({
        place: '--tmrt',
        problem: 'outside the UTCI validity range relative to --ta',
        value: tmrt,
        expected: `Tmrt − Ta in (−30, 70) K, i.e. --tmrt between ${ta - 30} and ${ta + 70} °C for --ta ${ta} (Bröde et al. 2012)`,
      });
    }
    const u = utciC({ airTempC: ta, mrtC: tmrt, wind10mMs: options.wind as number, relativeHumidityPct: options.rh as number });
    const id = utciStressCategory(u);
    const label = UTCI_CATEGORIES.find((c) => c.id === id)?.label ?? id;
    if (options.json) io.out(JSON.stringify({ utciC: Math.round(u * 100) / 100, category: id }) + '\n');
    else io.out(`UTCI ${u.toFixed(1)} °C — ${label}\n`);
    return 0;
  },
};
