import { Foundation1764650000000 } from './1764650000000-foundation';
import { Supply1764660000000 } from './1764660000000-supply';
import { SiteDataVersion1764665000000 } from './1764665000000-site-data-version';
import { Capacity1764670000000 } from './1764670000000-capacity';
import { Orders1764680000000 } from './1764680000000-orders';
import { Usage1764690000000 } from './1764690000000-usage';
import { SignInDefences1765000001000 } from './1765000001000-sign-in-defences';
import { SessionGeneration1765000002000 } from './1765000002000-session-generation';
import { RequestAmendedBy1765000002050 } from './1765000002050-request-amended-by';
import { MoneyBigint1765000002100 } from './1765000002100-money-bigint';
import { WardGrants1765000003000 } from './1765000003000-ward-grants';
import { CylinderResidual1765000004100 } from './1765000004100-cylinder-residual';
import { TankOperatingPressure1765000004200 } from './1765000004200-tank-operating-pressure';

/** Migrations in order. Production, start and tests run the same list. */
export const migrations = [
  Foundation1764650000000,
  Supply1764660000000,
  SiteDataVersion1764665000000,
  Capacity1764670000000,
  Orders1764680000000,
  Usage1764690000000,
  SignInDefences1765000001000,
  SessionGeneration1765000002000,
  RequestAmendedBy1765000002050,
  MoneyBigint1765000002100,
  WardGrants1765000003000,
  CylinderResidual1765000004100,
  TankOperatingPressure1765000004200,
];
