import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "@/db/seed/people";
import { homePathFor, ROLES } from "@/lib/auth/roles";
import { expectPath, formError, launchBrowser, newPage, PHONE, screenshot, signIn, waitForMail } from "./browser";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("signing in", () => {
  it.each(ROLES.map((role) => [role, DEMO_PEOPLE.find((p) => p.role === role)!]))(
    "%s lands on its own home",
    async (role, person) => {
      const phoneRoles = ["driver", "clinic_staff"];
      const { context, page } = await newPage(browser, phoneRoles.includes(role) ? PHONE : undefined);
      try {
        await signIn(page, person.email, DEMO_PASSWORD);
        await expectPath(page, homePathFor(role));
        if (phoneRoles.includes(role)) {
          await page.getByRole("button", { name: "Open menu" }).click();
          await expect.poll(() => page.getByTestId("shell-user-name").last().textContent()).toBe(person.name);
          await screenshot(page, `home-${role}-menu`);
          await page.getByRole("button", { name: "Close menu" }).click();
        } else {
          await expect.poll(() => page.getByTestId("shell-user-name").first().textContent()).toBe(person.name);
        }
        await screenshot(page, `home-${role}`);
        // The other audiences' pages send the user back to their own home.
        await page.goto(role === "clinic_manager" || role === "clinic_staff" ? "/unit" : "/clinic");
        await expectPath(page, homePathFor(role));
      } finally {
        await context.close();
      }
    },
  );

  it("shows an error for a wrong password", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "finance@larkmoor.example", "not the password");
      await expect.poll(() => formError(page).textContent()).toContain("Wrong e-mail or password");
      expect(new URL(page.url()).pathname).toBe("/sign-in");
      await screenshot(page, "sign-in-wrong-password");
    } finally {
      await context.close();
    }
  });

  it("throttles the sixth failure in a row and says when to try again", async () => {
    const { context, page } = await newPage(browser);
    try {
      // An account no other end-to-end file signs in with: it stays locked for 15 minutes.
      for (let i = 0; i < 5; i++) {
        await signIn(page, "driver2@larkmoor.example", `wrong-${i}`);
        await expect.poll(() => formError(page).textContent()).toContain("Wrong e-mail or password");
      }
      await signIn(page, "driver2@larkmoor.example", DEMO_PASSWORD);
      await expect.poll(() => formError(page).textContent()).toMatch(/Too many failed sign-ins.*Try again after \d\d:\d\d/);
      await screenshot(page, "sign-in-throttled");
    } finally {
      await context.close();
    }
  });

  it("serves pages with security headers and a content security policy they pass", async () => {
    const { context, page } = await newPage(browser);
    const violations: string[] = [];
    page.on("console", (message) => {
      if (/Content Security Policy|Refused to/i.test(message.text())) violations.push(message.text());
    });
    try {
      const response = await page.goto("/sign-in");
      const headers = response!.headers();
      expect(headers["content-security-policy"]).toContain("default-src 'self'");
      expect(headers["x-frame-options"]).toBe("DENY");
      expect(headers["x-content-type-options"]).toBe("nosniff");
      await signIn(page, "admin@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("link", { name: "People" }).first().click();
      await expectPath(page, "/unit/users");
      await expect.poll(() => page.getByRole("cell", { name: /Imogen Harcastle/ }).count()).toBeGreaterThan(0);
      expect(violations).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it("signs out", async () => {
    const { context, page } = await newPage(browser);
    try {
      await signIn(page, "quality@larkmoor.example", DEMO_PASSWORD);
      await expectPath(page, "/unit");
      await page.getByRole("button", { name: "Sign out" }).first().click();
      await expectPath(page, "/sign-in");
      await page.goto("/unit");
      await expectPath(page, "/sign-in");
    } finally {
      await context.close();
    }
  });
});

describe("inviting a colleague", () => {
  it("a clinic manager invites a user, who sets a password from the e-mailed link and signs in", async () => {
    const { context, page } = await newPage(browser);
    const email = "rhian.vossel@marrowgate.example";
    try {
      await signIn(page, "manager@marrowgate.example", DEMO_PASSWORD);
      await expectPath(page, "/clinic");
      await page.getByRole("link", { name: "Team", exact: true }).first().click();
      await expectPath(page, "/clinic/team");
      await expect.poll(() => page.getByRole("cell", { name: /Farah Lindqvist/ }).count()).toBeGreaterThan(0);
      await page.getByRole("button", { name: "Invite someone" }).click();
      const dialog = page.getByRole("dialog");
      // Bad input first: the form says what to fix and sends nothing.
      await dialog.getByLabel("E-mail").fill("not-an-address");
      await dialog.getByRole("button", { name: "Send invitation" }).click();
      await expect.poll(() => dialog.getByText("Enter the person's name.").count()).toBe(1);
      await expect.poll(() => dialog.getByText(/Enter a valid e-mail address/).count()).toBe(1);
      await dialog.getByLabel("Name").fill("Rhian Vossel");
      await dialog.getByLabel("E-mail").fill(email);
      await dialog.getByLabel("Role").selectOption("clinic_staff");
      await dialog.getByLabel("Site").selectOption({ label: "Millbeck Dental" });
      await screenshot(page, "invite-dialog");
      await dialog.getByRole("button", { name: "Send invitation" }).click();
      await expect.poll(() => page.getByRole("dialog").count()).toBe(0);
      await expect.poll(() => page.getByRole("cell", { name: /Rhian Vossel/ }).count()).toBeGreaterThan(0);
      await screenshot(page, "team-after-invite");

      const mail = await waitForMail(email, /invited to Steamlane/);
      const link = mail.text.match(/https?:\/\/\S+\/accept-invite\/\S+/)?.[0];
      expect(link).toBeTruthy();
      expect(mail.html).toContain("Choose your password");

      const invitee = await newPage(browser, PHONE);
      try {
        await invitee.page.goto(link!);
        await expect.poll(() => invitee.page.getByRole("heading", { name: "Welcome, Rhian Vossel" }).count()).toBe(1);
        await invitee.page.getByLabel("New password").fill("short");
        await invitee.page.getByLabel("Repeat the password").fill("short");
        await invitee.page.getByRole("button", { name: /Save password/ }).click();
        await expect.poll(() => invitee.page.getByText("Use at least 12 characters.").count()).toBe(1);
        await invitee.page.getByLabel("New password").fill("millbeck sterile trays");
        await invitee.page.getByLabel("Repeat the password").fill("millbeck sterile trays");
        await invitee.page.getByRole("button", { name: /Save password/ }).click();
        await expectPath(invitee.page, "/clinic");
        await expect.poll(() => invitee.page.getByText("Millbeck Dental").count()).toBeGreaterThan(0);
        await screenshot(invitee.page, "invitee-home");

        // The link worked once.
        await invitee.page.goto(link!);
        await expect.poll(() => invitee.page.getByText(/already been used/).count()).toBe(1);
      } finally {
        await invitee.context.close();
      }
    } finally {
      await context.close();
    }
  });
});
