import type { Request } from 'express';
import { firmDateSettingsSchema, type FirmDateSettingsBody } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { validate } from '../core/validate';
import { firmDates, setFirmDates } from './firms.repository';

const callerOf = (req: Request): Caller => req.caller as Caller;

/** The principal's settings for the whole firm. Everyone else reads them through GET /api/me. */
export function firmRoutes(db: Db): RouteDecl[] {
  return [
    route('get', '/firm-settings', 'principal', async (req, res) => {
      const body: FirmDateSettingsBody = await firmDates(db, callerOf(req).firmId);
      res.json(body);
    }),
    route('put', '/firm-settings', 'principal', validate({ body: firmDateSettingsSchema }), async (req, res) => {
      const { dateLocale, timeZone } = req.body as FirmDateSettingsBody;
      // Stored in the form Intl writes it ("en-gb" becomes "en-GB"), so every reader gets the same tag.
      const [canonical] = Intl.getCanonicalLocales(dateLocale);
      const body: FirmDateSettingsBody = await setFirmDates(db, callerOf(req).firmId, {
        dateLocale: canonical,
        timeZone,
      });
      req.log?.info({ dateLocale: canonical, timeZone }, 'firm date settings changed');
      res.json(body);
    }),
  ];
}
