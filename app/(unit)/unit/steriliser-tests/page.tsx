import type { Metadata } from "next";
import { MachineTestForm } from "@/components/sterilising/machine-test-form";
import { ReleaseAdvisory } from "@/components/sterilising/release-advisory";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { listSteriliserTests, type MachineTestView } from "@/lib/sterilising/machine-tests";
import { getSterileSettings } from "@/lib/sterilising/settings";

export const metadata: Metadata = { title: "Steriliser tests" };
export const dynamic = "force-dynamic";

function Result({ test, what }: { test: MachineTestView | null; what: string }) {
  if (!test) return <Badge tone="neutral">No {what}</Badge>;
  const detail = test.leakRateKpaMin !== null ? ` ${test.leakRateKpaMin} kPa/min` : "";
  return <Badge tone={test.result === "pass" ? "ok" : "danger"}>{`${test.result === "pass" ? "Passed" : "Failed"}${detail}`}</Badge>;
}

// The sterilisers' daily tests: record today's, and the last two weeks at a glance.
export default async function SteriliserTestsPage() {
  await requirePermission("sterilisers.test");
  const db = getDb();
  const [machines, settings] = await Promise.all([listSteriliserTests(db, 14), getSterileSettings(db)]);
  return (
    <>
      <PageHeader
        title="Steriliser tests"
        description="Every day before the first load: the air-removal (Bowie-Dick type) test with an empty chamber, and the vacuum leak test. A load cannot start or be released without a passed air-removal test that day."
      />
      <div className="grid gap-6 lg:grid-cols-[2fr_3fr]">
        <Card>
          <CardHeader title="Record today's test" />
          <CardBody className="space-y-4">
            <MachineTestForm sterilisers={machines.map((m) => ({ id: m.id, code: m.code, name: m.name }))} leakLimitKpaMin={settings.leakLimitKpaMin} />
            <ReleaseAdvisory />
          </CardBody>
        </Card>
        <div className="space-y-6">
          {machines.map((m) => (
            <Card key={m.id}>
              <CardHeader title={`${m.code} · ${m.name}`} description="The last 14 days (latest test of each day)" />
              <div className="overflow-x-auto">
                <table className="w-full text-left text-sm" data-testid={`tests-${m.code}`}>
                  <thead className="text-xs uppercase text-muted">
                    <tr>
                      <th className="px-4 py-2 font-medium">Day</th>
                      <th className="px-4 py-2 font-medium">Air removal</th>
                      <th className="px-4 py-2 font-medium">Leak test</th>
                      <th className="px-4 py-2 font-medium">By</th>
                    </tr>
                  </thead>
                  <tbody className="divide-y divide-line">
                    {m.days.map((d) => (
                      <tr key={d.unitDay}>
                        <td className="px-4 py-2">{d.unitDay}</td>
                        <td className="px-4 py-2">
                          <Result test={d.airRemoval} what="test" />
                        </td>
                        <td className="px-4 py-2">
                          <Result test={d.leak} what="test" />
                        </td>
                        <td className="px-4 py-2 text-muted">{d.airRemoval?.performedBy ?? d.leak?.performedBy ?? "—"}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            </Card>
          ))}
        </div>
      </div>
    </>
  );
}
