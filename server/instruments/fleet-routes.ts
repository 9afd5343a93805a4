import { instrumentsRoutes } from './instruments-routes';
import { loansRoutes } from '../loans/loans-routes';
import { repairsRoutes } from '../repairs/repairs-routes';
import { countsRoutes } from '../counts/counts-routes';
import { planningRoutes } from '../planning/planning-routes';

/** The fleet's routers under /api: instruments, loans, repairs, counts and planning. */
export const fleetRoutes = [
  instrumentsRoutes,
  loansRoutes,
  repairsRoutes,
  countsRoutes,
  planningRoutes,
];

/** The guardian's signing pages, mounted outside /api. */
export { agreementPages } from '../loans/agreement-pages';
