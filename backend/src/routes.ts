import type { RouteDef } from './http/route';
import { healthRoutes } from './modules/health/health.routes';
import { authRoutes } from './modules/auth/auth.routes';
import { siteRoutes } from './modules/sites/sites.routes';
import { userRoutes } from './modules/users/users.routes';
import { catalogueRoutes } from './modules/catalogue/catalogue.routes';
import { auditRoutes } from './modules/audit/audit.routes';
import { mailRoutes } from './modules/mail/mail.routes';
import { calcRoutes } from './modules/calc/calc.routes';
import { supplyRoutes } from './modules/supply/supply.routes';
import { forecastRoutes } from './modules/forecast/forecast.routes';
import { capacityRoutes } from './modules/capacity/capacity.routes';
import { orderRoutes } from './modules/orders/orders.routes';
import { usageRoutes } from './modules/usage/usage.routes';
import { importRoutes } from './modules/imports/imports.routes';

/**
 * The route table: every API route with the roles that may call it. The app registers exactly these,
 * and the role-matrix test reads the same list, so a new route cannot escape the matrix.
 */
export function routeTable(): RouteDef[] {
  return [
    ...healthRoutes(),
    ...authRoutes(),
    ...siteRoutes(),
    ...userRoutes(),
    ...catalogueRoutes(),
    ...auditRoutes(),
    ...mailRoutes(),
    ...calcRoutes(),
    ...supplyRoutes(),
    ...forecastRoutes(),
    ...capacityRoutes(),
    ...orderRoutes(),
    ...usageRoutes(),
    ...importRoutes(),
  ];
}
