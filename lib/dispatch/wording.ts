// Fixed wording shared by the manifest page and its PDF.

export const ADVISORY_MANIFEST =
  "Planned times are estimates from the route planner. The driver, the unit's procedures and local transport rules decide on the road; soiled and clean carts travel in their separate compartments.";
