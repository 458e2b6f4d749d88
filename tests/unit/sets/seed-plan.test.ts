import { describe, expect, it } from "vitest";
import { INSTANCES_BY_CLASS, planDemoSets, type PlannedSetTypeInput, type PlannedSiteInput } from "@/db/seed/sets";

const now = new Date("2026-12-01T09:00:00Z");
const types: PlannedSetTypeInput[] = [
  { id: 11, organisationId: 1, code: "GEN-MAJ", setClass: "major_tray" },
  { id: 12, organisationId: 1, code: "GEN-BAS", setClass: "basic_tray" },
  { id: 13, organisationId: 1, code: "SCIS-01", setClass: "single_instrument" },
  { id: 21, organisationId: 2, code: "CAS-EXAM", setClass: "dental_cassette" },
  { id: 22, organisationId: 2, code: "LOAN-HIP", setClass: "loaner_set" },
  { id: 23, organisationId: 2, code: "ODD-01", setClass: "something_new" },
];
const sites = new Map<number, PlannedSiteInput[]>([
  [1, [{ id: 101 }, { id: 102 }, { id: 103 }]],
  [2, [{ id: 201 }, { id: 202 }]],
]);
const siteIds = (org: number) => (sites.get(org) ?? []).map((s) => s.id);

describe("the demo's set plan", () => {
  const plan = planDemoSets(types, sites, now);

  it("gives every set type between 2 and 8 instances, within its class's range", () => {
    for (const type of types) {
      const count = plan.filter((p) => p.setTypeId === type.id).length;
      const [min, max] = INSTANCES_BY_CLASS[type.setClass] ?? [2, 4];
      expect(count, type.code).toBeGreaterThanOrEqual(min);
      expect(count, type.code).toBeLessThanOrEqual(max);
      expect(count).toBeGreaterThanOrEqual(2);
      expect(count).toBeLessThanOrEqual(8);
    }
  });

  it("places sets only at their own organisation's sites, spreading a type over them", () => {
    for (const planned of plan) expect(siteIds(planned.organisationId)).toContain(planned.homeSiteId);
    const homes = new Set(plan.filter((p) => p.setTypeId === 13).map((p) => p.homeSiteId));
    expect(homes.size).toBe(3); // at least 5 instances over 3 sites, round the sites in turn
  });

  it("numbers each organisation's sets 1, 2, 3… without gaps", () => {
    for (const org of [1, 2]) {
      const sequences = plan.filter((p) => p.organisationId === org).map((p) => p.sequence);
      expect(sequences).toEqual(sequences.map((_, i) => i + 1));
    }
  });

  it("dates sets before the demo's 90 days of history, retirements after purchase and before now", () => {
    for (const planned of plan) {
      const age = (now.getTime() - Date.parse(planned.createdAt)) / 86_400_000;
      expect(age).toBeGreaterThan(90);
      if (planned.retired) {
        expect(planned.retired.at > planned.createdAt).toBe(true);
        expect(Date.parse(planned.retired.at)).toBeLessThan(now.getTime());
        expect(planned.retired.reason.length).toBeGreaterThan(10);
      }
    }
  });

  it("is the same for the same input, whatever order the set types come in", () => {
    expect(planDemoSets([...types].reverse(), sites, now)).toEqual(plan);
  });

  it("leaves out organisations without sites", () => {
    expect(planDemoSets(types, new Map([[1, [{ id: 101 }]]]), now).every((p) => p.organisationId === 1)).toBe(true);
  });

  it("keeps set types at the sites that fit them", () => {
    const fitted = new Map<number, PlannedSiteInput[]>([
      // 103 keeps the single instruments only, and nobody else does; 102 also keeps basic trays.
      [1, [{ id: 101 }, { id: 102, accepts: ["GEN-BAS"] }, { id: 103, accepts: ["SCIS-"], exclusive: true }]],
      [2, [{ id: 201, accepts: ["NOTHING-"] }]],
    ]);
    const fittedPlan = planDemoSets(types, fitted, now);
    const homes = (typeId: number) => new Set(fittedPlan.filter((p) => p.setTypeId === typeId).map((p) => p.homeSiteId));
    expect(homes(13)).toEqual(new Set([103]));
    expect(homes(11)).toEqual(new Set([101]));
    expect([...homes(12)].every((id) => id === 101 || id === 102)).toBe(true);
    // A type no site accepts still gets a home rather than vanishing from the demo.
    expect(homes(21)).toEqual(new Set([201]));
  });
});
