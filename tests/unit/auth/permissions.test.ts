import { describe, expect, it } from "vitest";
import { ACTIONS, assertCan, can, PERMISSIONS } from "@/lib/auth/permissions";
import { audienceOf, CUSTOMER_ROLES, homePathFor, ROLES, UNIT_ROLES } from "@/lib/auth/roles";
import { AppError } from "@/lib/errors";

describe("the permission table", () => {
  it("has an entry for each of the eight roles, naming only known actions", () => {
    expect(Object.keys(PERMISSIONS).sort()).toEqual([...ROLES].sort());
    expect(ROLES).toHaveLength(8);
    for (const role of ROLES) {
      for (const action of PERMISSIONS[role]) expect(ACTIONS).toContain(action);
      expect(new Set(PERMISSIONS[role]).size).toBe(PERMISSIONS[role].length);
    }
  });

  it("lets every role see its home", () => {
    for (const role of ROLES) expect(can(role, "home.view")).toBe(true);
  });

  it("gives user management to administrators and clinic managers only", () => {
    const managers = ROLES.filter((r) => can(r, "users.invite"));
    expect(managers.sort()).toEqual(["admin", "clinic_manager"]);
    expect(can("clinic_staff", "users.view")).toBe(false);
    expect(can("driver", "users.manage")).toBe(false);
  });

  it("keeps organisation and site administration with the administrator", () => {
    for (const role of ROLES) {
      expect(can(role, "organisations.manage")).toBe(role === "admin");
      expect(can(role, "sites.manage")).toBe(role === "admin");
    }
  });

  it("never lets a customer role list the unit's organisations", () => {
    for (const role of CUSTOMER_ROLES) expect(can(role, "organisations.view")).toBe(false);
  });

  it("gives vans to the administrator, planning to the dispatcher and run sheets to drivers", () => {
    for (const role of ROLES) {
      expect(can(role, "vans.manage")).toBe(role === "admin");
      expect(can(role, "routes.plan")).toBe(role === "dispatcher");
      expect(can(role, "runs.work")).toBe(role === "driver");
    }
    expect(ROLES.filter((r) => can(r, "routes.view")).sort()).toEqual(["admin", "dispatcher"]);
    for (const role of CUSTOMER_ROLES) expect(can(role, "routes.view")).toBe(false);
  });

  it("lets technicians run loads and record steriliser tests, and keeps release and recall with the quality lead", () => {
    const sorted = (action: Parameters<typeof can>[1]) => ROLES.filter((r) => can(r, action)).sort();
    expect(sorted("sterilisers.test")).toEqual(["quality_lead", "technician"]);
    expect(sorted("loads.operate")).toEqual(["quality_lead", "technician"]);
    expect(sorted("loads.release")).toEqual(["quality_lead"]);
    expect(sorted("recalls.manage")).toEqual(["quality_lead"]);
    expect(sorted("sterile_settings.manage")).toEqual(["quality_lead"]);
    for (const role of CUSTOMER_ROLES) {
      expect(can(role, "loads.view")).toBe(false);
      // Customers see recalls that affect them, scoped to their organisation.
      expect(can(role, "recalls.view")).toBe(true);
    }
    expect(can("driver", "recalls.view")).toBe(false);
    expect(can("finance", "loads.release")).toBe(false);
  });

  it("lets technicians record routine monitoring entries and keeps services, clearing faults and limits with the quality lead", () => {
    const sorted = (action: Parameters<typeof can>[1]) => ROLES.filter((r) => can(r, action)).sort();
    expect(sorted("machine_log.view")).toEqual(["admin", "quality_lead", "technician"]);
    expect(sorted("machine_log.record")).toEqual(["quality_lead", "technician"]);
    expect(sorted("machine_log.manage")).toEqual(["quality_lead"]);
    for (const role of CUSTOMER_ROLES) expect(can(role, "machine_log.view")).toBe(false);
  });

  it("gives the unit's reports to its managers and the customer's reports to clinic people only", () => {
    const sorted = (action: Parameters<typeof can>[1]) => ROLES.filter((r) => can(r, action)).sort();
    expect(sorted("reports.unit")).toEqual(["admin", "dispatcher", "finance", "quality_lead"]);
    expect(sorted("reports.customer")).toEqual(["clinic_manager", "clinic_staff"]);
    expect(can("driver", "reports.unit")).toBe(false);
    expect(can("technician", "reports.unit")).toBe(false);
  });

  it("assertCan throws a 403 application error", () => {
    expect(() => assertCan({ role: "clinic_staff" }, "users.invite")).toThrowError(AppError);
    try {
      assertCan({ role: "driver" }, "users.view");
    } catch (error) {
      expect((error as AppError).status).toBe(403);
    }
    expect(() => assertCan({ role: "admin" }, "users.invite")).not.toThrow();
  });
});

describe("homes by role", () => {
  it("sends customers to the clinic views, drivers to theirs, and the unit's staff to the unit's", () => {
    for (const role of CUSTOMER_ROLES) expect(homePathFor(role)).toBe("/clinic");
    for (const role of UNIT_ROLES) expect(audienceOf(role)).toBe(role === "driver" ? "driver" : "unit");
    expect(homePathFor("driver")).toBe("/driver");
    expect(homePathFor("quality_lead")).toBe("/unit");
  });
});
