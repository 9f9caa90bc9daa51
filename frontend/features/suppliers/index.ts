/** What other features use of suppliers: the workspace's supplier list. */
export { suppliersQueryOptions, useSuppliers } from "./api/get-suppliers";
