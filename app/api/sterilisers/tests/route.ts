// POST /api/sterilisers/tests — record a steriliser's daily air-removal or vacuum leak test
import { withAuth } from "@/lib/http/route";
import { recordMachineTest } from "@/lib/sterilising/machine-tests";
import { machineTestSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth("sterilisers.test", async ({ req, db, user }) => ({ test: await recordMachineTest(db, user, await readBody(req, machineTestSchema)) }));
