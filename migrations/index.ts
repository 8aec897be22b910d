import type { Knex } from 'knex';
import * as m20261201000000 from './20261201000000_core';
import * as m20261202000000 from './20261202000000_access';
import * as m20261202000100 from './20261202000100_identity';
import * as m20261210000000 from './20261210000000_stages';
import * as m20261220000100 from './20261220000100_one_pending_invitation';
import * as m20261220000400 from './20261220000400_identity_sign_in_throttle';
import * as m20261221000000 from './20261221000000_drawings';
import * as m20261222000001 from './20261222000001_fees';
import * as m20261222000101 from './20261222000101_fee_activity';
import * as m20261223000001 from './20261223000001_schemes';
import * as m20261224000001d from './20261224000001_drawing_current_revision';
import * as m20261224000001s from './20261224000001_stage_submissions';
import * as m20261224000201 from './20261224000201_scheme_outputs';
import * as m20261225000001 from './20261225000001_list_change_notices';
import * as m20261227000001 from './20261227000001_session_change_notices';
import * as m20261228000201 from './20261228000201_plan_sheet_paper';
import * as m20261228000301 from './20261228000301_firm_date_settings';

/** Every migration, by name, in the order they run. Add new ones here as well as in the folder. */
export const migrations: Record<string, Knex.Migration> = {
  '20261201000000_core': m20261201000000,
  '20261202000000_access': m20261202000000,
  '20261202000100_identity': m20261202000100,
  '20261210000000_stages': m20261210000000,
  '20261220000100_one_pending_invitation': m20261220000100,
  '20261220000400_identity_sign_in_throttle': m20261220000400,
  '20261221000000_drawings': m20261221000000,
  '20261222000001_fees': m20261222000001,
  '20261222000101_fee_activity': m20261222000101,
  '20261223000001_schemes': m20261223000001,
  '20261224000001_drawing_current_revision': m20261224000001d,
  '20261224000001_stage_submissions': m20261224000001s,
  '20261224000201_scheme_outputs': m20261224000201,
  '20261225000001_list_change_notices': m20261225000001,
  '20261227000001_session_change_notices': m20261227000001,
  '20261228000201_plan_sheet_paper': m20261228000201,
  '20261228000301_firm_date_settings': m20261228000301,
};
