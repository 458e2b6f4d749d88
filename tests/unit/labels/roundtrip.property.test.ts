import { getDaysInMonth } from "date-fns";
import fc from "fast-check";
import { describe, expect, it } from "vitest";

import {
  type AiDefinition,
  encodeElementString,
  formatHumanReadable,
  GS,
  GS1_AIS,
  Gs1Error,
  gs1CheckDigit,
  gs1Year,
  makeSetGiai,
  parseElementString,
  parseScan,
} from "@/lib/labels/gs1";

const now = new Date("2026-06-15T00:00:00Z");

// GS1 AI encodable character set 82 (GS1 General Specifications figure 7.11-1).
const CSET82 = `!"%&'()*+,-./0123456789:;<=>?ABCDEFGHIJKLMNOPQRSTUVWXYZ_abcdefghijklmnopqrstuvwxyz`;

const digits = (minLength: number, maxLength: number) =>
  fc.string({ unit: fc.constantFrom(..."0123456789"), minLength, maxLength });
const cset82 = (minLength: number, maxLength: number) =>
  fc.string({ unit: fc.constantFrom(...CSET82), minLength, maxLength });
const pad2 = (n: number) => String(n).padStart(2, "0");

// A yymmdd date valid in the century the reference date gives it; day 00 only where allowed.
const yymmdd = (allowDayZero: boolean) =>
  fc
    .record({ yy: fc.integer({ min: 0, max: 99 }), month: fc.integer({ min: 1, max: 12 }), day: fc.integer({ min: 0, max: 31 }) })
    .map(({ yy, month, day }) => {
      const last = getDaysInMonth(new Date(gs1Year(yy, now), month - 1, 1));
      const clamped = Math.min(day, last);
      return pad2(yy) + pad2(month) + pad2(clamped === 0 && !allowDayZero ? 1 : clamped);
    });

// Any valid value for one AI of the table.
function validValue(definition: AiDefinition): fc.Arbitrary<string> {
  if (definition.date === "yymmd0") return yymmdd(true);
  if (definition.date === "yymmddhhmm") {
    return fc
      .tuple(yymmdd(false), fc.integer({ min: 0, max: 23 }), fc.integer({ min: 0, max: 59 }))
      .map(([date, hour, minute]) => date + pad2(hour) + pad2(minute));
  }
  if (definition.checkDigit) {
    return digits(definition.length - 1, definition.length - 1).map((body) => body + gs1CheckDigit(body));
  }
  if (definition.charset === "numeric") {
    return definition.fixedLength ? digits(definition.length, definition.length) : digits(1, definition.length);
  }
  if (definition.companyPrefix) {
    return fc.tuple(digits(4, 12), cset82(0, 18)).map(([prefix, rest]) => (prefix + rest).slice(0, definition.length));
  }
  return cset82(1, definition.length);
}

const elementLists = fc
  .uniqueArray(fc.constantFrom(...GS1_AIS), { selector: (definition) => definition.ai, minLength: 1, maxLength: 8 })
  .chain((definitions) =>
    fc.tuple(...definitions.map(validValue)).map((values) => definitions.map((definition, i) => ({ ai: definition.ai, value: values[i] }))),
  );

const pairs = (elements: Array<{ ai: string; value: string }>) => elements.map(({ ai, value }) => ({ ai, value }));

describe("encode → parse round trip", () => {
  it("gives back every element, in order, from the transmitted form", () => {
    fc.assert(
      fc.property(elementLists, (elements) => {
        // "<GS>" is a separator substitute when no real GS is present; such data is ambiguous.
        fc.pre(!elements.some((element) => element.value.includes("<GS>")));
        const raw = encodeElementString(elements, { now, checkAssociations: false });
        expect(pairs(parseElementString(raw, { now }))).toEqual(elements);
        expect(pairs(parseElementString("]d2" + raw, { now }))).toEqual(elements);
        // The same string with the substitute a scanner may type instead of GS.
        expect(pairs(parseElementString(raw.split(GS).join("{GS}"), { now }))).toEqual(elements);
      }),
      { numRuns: 500 },
    );
  });

  it("gives back every element from the bracketed form", () => {
    fc.assert(
      fc.property(elementLists, (elements) => {
        // Data containing "(" + 2–4 digits + ")" cannot be told from the next AI in this form.
        fc.pre(!elements.some((element) => /\(\d{2,4}\)/.test(element.value)));
        expect(pairs(parseElementString(formatHumanReadable(elements), { now }))).toEqual(elements);
      }),
      { numRuns: 300 },
    );
  });

  it("round-trips any GIAI through a set label scan", () => {
    const giaiParts = fc.tuple(digits(4, 12), cset82(1, 18)).filter(([prefix, serial]) => prefix.length + serial.length <= 30);
    fc.assert(
      fc.property(giaiParts, ([prefix, serial]) => {
        const giai = makeSetGiai(prefix, serial);
        const raw = encodeElementString([{ ai: "8004", value: giai }]);
        expect(raw).toBe("8004" + giai);
        for (const scanned of [`]d2${raw}\r\n`, raw, `(8004)${giai}`]) {
          expect(parseScan(scanned, { now })).toEqual({ kind: "set", giai, elements: [{ ai: "8004", value: giai }] });
        }
      }),
      { numRuns: 300 },
    );
  });
});

describe("robustness", () => {
  it("throws only Gs1Error, whatever the scanner sends", () => {
    const noise = fc.oneof(
      fc.string(),
      fc.string({ unit: fc.constantFrom(..."0123456789()<>GS]dC1\u001d") }),
      elementLists.map((elements) => encodeElementString(elements, { now, checkAssociations: false }).slice(0, -1)),
    );
    fc.assert(
      fc.property(noise, (raw) => {
        for (const parse of [() => parseElementString(raw, { now }), () => parseScan(raw, { now })]) {
          try {
            parse();
          } catch (error) {
            expect(error).toBeInstanceOf(Gs1Error);
          }
        }
      }),
      { numRuns: 1000 },
    );
  });
});
