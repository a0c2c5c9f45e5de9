import { Foundation1764650000000 } from './1764650000000-foundation';
import { Supply1764660000000 } from './1764660000000-supply';
import { SiteDataVersion1764665000000 } from './1764665000000-site-data-version';
import { Capacity1764670000000 } from './1764670000000-capacity';
import { Orders1764680000000 } from './1764680000000-orders';
import { Usage1764690000000 } from './1764690000000-usage';
import { CylinderResidual1765000004100 } from './1765000004100-cylinder-residual';
import { TankOperatingPressure1765000004200 } from './1765000004200-tank-operating-pressure';

/** Migrations in order. Production, start and tests run the same list. */
export const migrations = [Foundation1764650000000, Supply1764660000000, SiteDataVersion1764665000000, Capacity1764670000000, Orders1764680000000, Usage1764690000000, CylinderResidual1765000004100, TankOperatingPressure1765000004200];
