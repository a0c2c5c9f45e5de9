import { In, type EntityManager } from 'typeorm';
import { GAS_INFO, type GasCode } from '@common/gas/gases';
import { cylinderTypeName } from '@common/catalogue/cylinder-type';
import { OPEN_REQUEST_STATUSES } from '@common/schemas/orders.schema';
import { CylinderType, Supplier, SupplierPrice } from '../../db/entities/catalogue.entity';
import { Site } from '../../db/entities/site.entity';
import type { SupplySource } from '../../db/entities/supply.entity';
import { User, UserRole, UserSite } from '../../db/entities/user.entity';
import { ReorderRequestEvent } from '../../db/entities/orders.entity';
import type { Actor } from '../../http/context';
import type { AuditWho } from '../audit/audit.service';

export const OPEN = [...OPEN_REQUEST_STATUSES] as string[];

/** Who did it, for events and the audit log: a signed-in user, or Plenum itself (null). */
export type Doer = Actor | null;

export function whoOfDoer(doer: Doer, organisationId: number): AuditWho {
  return doer
    ? { organisationId, userId: doer.user.id, userEmail: doer.user.email, requestId: doer.requestId }
    : { organisationId, userId: null, userEmail: 'plenum (automatic)', requestId: null };
}

export async function addEvent(
  m: EntityManager,
  requestId: number,
  doer: Doer,
  action: string,
  fromStatus: string | null,
  toStatus: string | null,
  comment = '',
  detail?: unknown,
): Promise<void> {
  await m.getRepository(ReorderRequestEvent).insert({
    requestId,
    userId: doer?.user.id ?? null,
    userName: doer ? doer.user.name : 'Plenum',
    action,
    fromStatus,
    toStatus,
    comment: comment.slice(0, 1000),
    detailJson: detail === undefined ? null : JSON.stringify(detail),
  });
}

export function gasName(code: string): string {
  return GAS_INFO[code as GasCode]?.name ?? code;
}

/** What is ordered, as the supplier reads it: gas and cylinder type by water capacity and fill pressure, or bulk liquid. */
export function describeItem(source: SupplySource, cyl: CylinderType | null): string {
  if (source.type === 'bulk_liquid') return `${gasName(source.gasCode)}, bulk liquid (kg)`;
  return `${gasName(source.gasCode)} cylinders, ${cyl ? cylinderTypeName(cyl.waterCapacityL, cyl.fillPressureBar) : 'type not set'}`;
}

export function unitOf(source: SupplySource): 'kg' | 'cylinders' {
  return source.type === 'bulk_liquid' ? 'kg' : 'cylinders';
}

export interface Pricing {
  supplier: Supplier | null;
  unitPriceMinor: number | null;
  problem: string;
}

/** The supplier's list price for what a source takes: per cylinder of its type, or per kg of its gas. */
export async function priceFor(m: EntityManager, source: SupplySource, site: Site): Promise<Pricing> {
  if (!source.supplierId) return { supplier: null, unitPriceMinor: null, problem: 'This source has no supplier: set one on the source first.' };
  const supplier = await m.getRepository(Supplier).findOneBy({ id: source.supplierId });
  if (!supplier || !supplier.active) return { supplier: null, unitPriceMinor: null, problem: 'The supplier of this source is not active.' };
  const where =
    source.type === 'bulk_liquid'
      ? { supplierId: supplier.id, gasCode: source.gasCode, unit: 'kg' }
      : { supplierId: supplier.id, cylinderTypeId: source.cylinderTypeId ?? -1, unit: 'cylinder' };
  const price = await m.getRepository(SupplierPrice).findOneBy(where);
  if (!price)
    return { supplier, unitPriceMinor: null, problem: `${supplier.name} has no price for this item: ask an administrator to add it to the price list.` };
  if (supplier.currency !== site.currency)
    return {
      supplier,
      unitPriceMinor: price.priceMinor,
      problem: `${supplier.name} prices in ${supplier.currency} but the site accounts in ${site.currency}.`,
    };
  return { supplier, unitPriceMinor: price.priceMinor, problem: '' };
}

/** Line total in minor units: quantity × unit price, rounded to the minor unit (half away from zero). */
export function lineTotalMinor(quantity: number, unitPriceMinor: number): number {
  return Math.round(quantity * unitPriceMinor);
}

/** Formats minor units as money, e.g. 123456 GBP → "£1,234.56". */
export function formatMoney(minor: number, currency: string): string {
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(minor / 100);
  } catch {
    return `${(minor / 100).toFixed(2)} ${currency}`;
  }
}

export function formatQuantity(quantity: number, unit: string): string {
  return unit === 'kg' ? `${quantity.toLocaleString('en-GB')} kg` : `${quantity} cylinder${quantity === 1 ? '' : 's'}`;
}

/** Active users of the organisation with a role who may see a site (for copies and notices when no one raised a request). */
export async function usersWithRoleAtSite(m: EntityManager, organisationId: number, siteId: number, role: string): Promise<User[]> {
  const roleRows = await m.getRepository(UserRole).find({ where: { role } });
  if (!roleRows.length) return [];
  const siteRows = await m.getRepository(UserSite).find({ where: { siteId, userId: In(roleRows.map((r) => r.userId)) } });
  if (!siteRows.length) return [];
  return m.getRepository(User).find({ where: { id: In(siteRows.map((s) => s.userId)), organisationId, active: true }, order: { id: 'ASC' }, take: 5 });
}
