"use client";

import { FileUp, Plus, Table2, Trash2 } from "lucide-react";
import { type FormEvent, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { cn } from "@/lib/cn";
import { ENTERED_PHASES, type EnteredPhase, type EnteredSample } from "@/lib/washing/entered";
import type { BatchRecordInput } from "@/lib/washing/schemas";

const PHASE_LABELS: Record<EnteredPhase, string> = { "": "—", heating: "Heating", disinfection: "Disinfection", drying: "Drying" };
const MAX_BYTES = 5 * 1024 * 1024;

const emptyRows = (): EnteredSample[] => [
  { t: "0", tempC: "", phase: "heating" },
  { t: "", tempC: "", phase: "disinfection" },
  { t: "", tempC: "", phase: "disinfection" },
  { t: "", tempC: "", phase: "drying" },
];

/**
 * The record that closes a running batch: the washer's exported CSV file, or time and
 * temperature values typed off its display or printout. Problems come back with their line (or
 * row) and column and nothing is saved until the record can be read.
 */
export function RecordForm({
  busy,
  problems,
  onSubmit,
}: {
  busy: boolean;
  problems: string[];
  onSubmit: (record: BatchRecordInput) => void;
}) {
  const [mode, setMode] = useState<"file" | "entered">("file");
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [rows, setRows] = useState<EnteredSample[]>(emptyRows);

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setFileError(null);
    if (mode === "file") {
      if (!file) return setFileError("Choose the record file the washer exported.");
      if (file.size > MAX_BYTES) return setFileError("The file is too large: at most 5 MB.");
      onSubmit({ kind: "csv", fileName: file.name, text: await file.text() });
    } else {
      onSubmit({ kind: "entered", rows: rows.filter((r) => r.t.trim() !== "" || r.tempC.trim() !== "") });
    }
  };

  const setRow = (i: number, patch: Partial<EnteredSample>) => setRows((all) => all.map((r, k) => (k === i ? { ...r, ...patch } : r)));

  return (
    <form onSubmit={submit} className="space-y-4" noValidate>
      <div role="radiogroup" aria-label="How to give the record" className="grid gap-3 sm:grid-cols-2">
        {(
          [
            ["file", "Upload the washer's file", FileUp],
            ["entered", "Enter the values", Table2],
          ] as const
        ).map(([value, label, Icon]) => (
          <button
            key={value}
            type="button"
            role="radio"
            aria-checked={mode === value}
            onClick={() => setMode(value)}
            className={cn(
              "flex h-14 items-center justify-center gap-2 rounded-lg border-2 text-base font-medium focus-visible:outline-none focus-visible:ring-4 focus-visible:ring-lagoon-200",
              mode === value ? "border-lagoon-700 bg-lagoon-50 text-lagoon-800" : "border-line-strong bg-surface text-ink hover:bg-paper",
            )}
          >
            <Icon className="h-5 w-5" aria-hidden="true" /> {label}
          </button>
        ))}
      </div>

      {mode === "file" ? (
        <Field
          id="record-file"
          label="Record file (CSV)"
          hint="The time/temperature record as the washer exports it: a header row (e.g. t_s or timestamp, temp_c, phase) and one row per sample."
          error={fileError ?? undefined}
        >
          <Input
            id="record-file"
            type="file"
            accept=".csv,text/csv"
            className="h-14 py-3 text-base"
            onChange={(e) => setFile(e.target.files?.[0] ?? null)}
          />
        </Field>
      ) : (
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium text-ink">Samples, in time order</legend>
          <p className="text-xs text-muted">
            Seconds from the start of the record and the load temperature in °C. Mark the samples of the disinfection stage: only they count towards A0.
          </p>
          <div className="overflow-x-auto">
            <table className="w-full min-w-[28rem] text-sm">
              <thead className="text-left text-xs uppercase tracking-wide text-muted">
                <tr>
                  <th scope="col" className="py-1 pr-2">
                    Row
                  </th>
                  <th scope="col" className="py-1 pr-2">
                    Time (s)
                  </th>
                  <th scope="col" className="py-1 pr-2">
                    Temperature (°C)
                  </th>
                  <th scope="col" className="py-1 pr-2">
                    Stage
                  </th>
                  <th scope="col">
                    <span className="sr-only">Remove</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {rows.map((row, i) => (
                  <tr key={i}>
                    <td className="py-1 pr-2 tabular-nums text-muted">{i + 1}</td>
                    <td className="py-1 pr-2">
                      <Input aria-label={`Row ${i + 1}, time in seconds`} inputMode="decimal" value={row.t} onChange={(e) => setRow(i, { t: e.target.value })} className="h-12 text-base" />
                    </td>
                    <td className="py-1 pr-2">
                      <Input
                        aria-label={`Row ${i + 1}, temperature in °C`}
                        inputMode="decimal"
                        value={row.tempC}
                        onChange={(e) => setRow(i, { tempC: e.target.value })}
                        className="h-12 text-base"
                      />
                    </td>
                    <td className="py-1 pr-2">
                      <Select aria-label={`Row ${i + 1}, stage`} value={row.phase} onChange={(e) => setRow(i, { phase: e.target.value as EnteredPhase })} className="h-12 text-base">
                        {ENTERED_PHASES.map((p) => (
                          <option key={p} value={p}>
                            {PHASE_LABELS[p]}
                          </option>
                        ))}
                      </Select>
                    </td>
                    <td className="py-1">
                      <Button
                        variant="ghost"
                        size="lg"
                        className="px-3"
                        aria-label={`Remove row ${i + 1}`}
                        disabled={rows.length <= 2}
                        onClick={() => setRows((all) => all.filter((_, k) => k !== i))}
                      >
                        <Trash2 className="h-5 w-5" aria-hidden="true" />
                      </Button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <Button variant="secondary" size="lg" onClick={() => setRows((all) => [...all, { t: "", tempC: "", phase: all.at(-1)?.phase ?? "" }])}>
            <Plus className="h-5 w-5" aria-hidden="true" /> Add a row
          </Button>
        </fieldset>
      )}

      {problems.length > 0 && (
        <div role="alert" data-testid="record-problems" className="rounded-card border-2 border-danger-600 bg-danger-50 p-4 text-danger-700">
          <p className="text-lg font-semibold">✕ The record could not be read; nothing was saved.</p>
          <ul className="mt-2 list-disc space-y-1 pl-5 text-base">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </div>
      )}

      <Button type="submit" size="lg" variant="accent" disabled={busy} className="w-full sm:w-auto">
        {busy ? "Checking the record…" : "Close the batch with this record"}
      </Button>
    </form>
  );
}
