"use client";

import { useQueryClient } from "@tanstack/react-query";
import { CheckCircle2, Download, FileUp, XCircle } from "lucide-react";
import Link from "next/link";
import { useId, useState } from "react";
import { toast } from "sonner";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { fetchJson } from "@/lib/fetch-json";
import { IMPORT_COLUMNS, MAX_IMPORT_ROWS } from "@/lib/catalogue/import";
import type { ImportOutcome, ImportPlan, ImportPlanEntry } from "@/lib/catalogue/import-service";

const TEMPLATE =
  "code,name,set_class,packaging,method,flags,weight_kg,size_stu,notes,item,count\r\n" +
  'GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,"Needle holder, Mayo-Hegar 160 mm",1\r\n' +
  'GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,"Towel clip, Backhaus 110 mm",4\r\n';

function downloadTemplate() {
  const url = URL.createObjectURL(new Blob([TEMPLATE], { type: "text/csv;charset=utf-8" }));
  const a = document.createElement("a");
  a.href = url;
  a.download = "catalogue-import-template.csv";
  a.click();
  URL.revokeObjectURL(url);
}

function EntryList({ entries, showChanges }: { entries: ImportPlanEntry[]; showChanges?: boolean }) {
  return (
    <ul className="divide-y divide-line text-sm">
      {entries.map((e) => (
        <li key={e.code} className="py-2">
          <p>
            <span className="font-mono text-xs font-semibold">{e.code}</span> <span className="font-medium text-ink">{e.name}</span>{" "}
            <span className="text-muted">
              · {e.itemCount} contents line{e.itemCount === 1 ? "" : "s"} · from line {e.line}
            </span>
          </p>
          {showChanges && e.changes && (
            <ul className="mt-1 list-inside list-disc text-muted">
              {e.changes.map((c) => (
                <li key={c}>{c}</li>
              ))}
            </ul>
          )}
        </li>
      ))}
    </ul>
  );
}

/** The catalogue import: choose a CSV, see every problem and what would change, then import it all at once. */
export function ImportPanel({ organisationId, organisationName }: { organisationId: number; organisationName: string }) {
  const inputId = useId();
  const queryClient = useQueryClient();
  const [file, setFile] = useState<File | null>(null);
  const [plan, setPlan] = useState<ImportPlan | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<"checking" | "importing" | null>(null);
  const [outcome, setOutcome] = useState<ImportOutcome | null>(null);

  const send = (url: string, chosen: File, sha?: string) => {
    const body = new FormData();
    body.set("file", chosen);
    body.set("organisationId", String(organisationId));
    if (sha) body.set("expectedSha256", sha);
    return fetchJson(url, { method: "POST", body });
  };

  const check = async (chosen: File | undefined) => {
    if (!chosen) return;
    setFile(chosen);
    setPlan(null);
    setOutcome(null);
    setError(null);
    setBusy("checking");
    try {
      setPlan((await send("/api/set-types/import/check", chosen)) as ImportPlan);
    } catch (e) {
      setError(e instanceof Error ? e.message : "The check did not work.");
    } finally {
      setBusy(null);
    }
  };

  const commit = async () => {
    if (!file || !plan) return;
    setBusy("importing");
    setError(null);
    try {
      const result = (await send("/api/set-types/import", file, plan.sha256)) as ImportOutcome;
      setOutcome(result);
      setPlan(null);
      setFile(null);
      toast.success(`Imported: ${result.created} new, ${result.updated} changed`);
      await queryClient.invalidateQueries({ queryKey: ["set-types"] });
    } catch (e) {
      setError(e instanceof Error ? e.message : "The import did not work.");
    } finally {
      setBusy(null);
    }
  };

  const writes = plan ? plan.create.length + plan.update.length : 0;
  const blocked = !plan || plan.issueCount > 0 || writes === 0;

  return (
    <div className="space-y-6">
      <Card>
        <CardHeader
          title="Choose the file"
          description={`Set types are matched by code: new codes are added, known codes are updated, and set types missing from the file stay as they are. Into the catalogue of ${organisationName}.`}
        />
        <CardBody className="space-y-4">
          <div className="flex flex-wrap items-center gap-3">
            <label
              htmlFor={inputId}
              className="inline-flex h-10 cursor-pointer items-center gap-2 rounded-lg bg-lagoon-700 px-4 text-sm font-medium text-white focus-within:ring-2 focus-within:ring-lagoon-300 focus-within:ring-offset-2 hover:bg-lagoon-800"
            >
              <FileUp className="h-4 w-4" aria-hidden="true" />
              {file ? "Choose another file" : "Choose a CSV file"}
              <input
                id={inputId}
                type="file"
                accept=".csv,text/csv"
                className="sr-only"
                aria-label="CSV file to import"
                disabled={busy !== null}
                onChange={(e) => {
                  void check(e.target.files?.[0]);
                  e.target.value = "";
                }}
              />
            </label>
            <Button variant="ghost" onClick={downloadTemplate}>
              <Download className="h-4 w-4" aria-hidden="true" />
              Template
            </Button>
            {file && <span className="text-sm text-muted">{file.name}</span>}
            {busy === "checking" && <span className="text-sm text-muted">Checking…</span>}
          </div>
          <details className="text-sm">
            <summary className="cursor-pointer font-medium text-ink">The file&apos;s columns</summary>
            <p className="mt-2 text-muted">
              UTF-8 CSV with commas between columns and a header line; one line per instrument of a set type, with the set type&apos;s fields
              repeated on each of its lines. At most {MAX_IMPORT_ROWS.toLocaleString("en-GB")} lines and 5 MB. Instructions for use are uploaded
              on each set type&apos;s page, not imported.
            </p>
            <dl className="mt-2 grid gap-x-4 gap-y-1 sm:grid-cols-[9rem_1fr]">
              {IMPORT_COLUMNS.map((c) => (
                <div key={c.name} className="contents">
                  <dt className="font-mono text-xs font-semibold text-ink">
                    {c.name}
                    {c.required ? "" : " (optional)"}
                  </dt>
                  <dd className="text-muted">{c.description}</dd>
                </div>
              ))}
            </dl>
          </details>
        </CardBody>
      </Card>

      {error && (
        <p role="alert" data-testid="import-error" className="rounded-card border border-danger-600/30 bg-danger-50 px-4 py-3 text-sm text-danger-700">
          {error}
        </p>
      )}

      {outcome && (
        <p role="status" className="flex items-center gap-2 rounded-card border border-ok-600/30 bg-ok-50 px-4 py-3 text-sm text-ok-700">
          <CheckCircle2 className="h-4 w-4" aria-hidden="true" />
          Imported {outcome.created} new and {outcome.updated} changed set types ({outcome.unchanged} unchanged).{" "}
          <Link href={`/unit/catalogue?organisation=${organisationId}`} className="font-medium underline">
            Open the catalogue
          </Link>
        </p>
      )}

      {plan && (
        <Card>
          <CardHeader title="Check result" description={`${plan.fileName}: ${plan.rowCount} lines read. Nothing has been written yet.`} />
          <CardBody className="space-y-5">
            <div className="flex flex-wrap gap-2" data-testid="import-summary">
              <Badge tone={plan.issueCount ? "danger" : "ok"}>
                {plan.issueCount} problem{plan.issueCount === 1 ? "" : "s"}
              </Badge>
              <Badge tone="info">{plan.create.length} new</Badge>
              <Badge tone="info">{plan.update.length} changed</Badge>
              <Badge tone="neutral">{plan.unchanged.length} unchanged</Badge>
              {plan.notInFile > 0 && <Badge tone="neutral">{plan.notInFile} not in the file, left as they are</Badge>}
            </div>

            {plan.issueCount > 0 && (
              <section aria-labelledby={`${inputId}-problems`} className="space-y-2">
                <h3 id={`${inputId}-problems`} className="flex items-center gap-2 text-sm font-semibold text-danger-700">
                  <XCircle className="h-4 w-4" aria-hidden="true" />
                  Fix these in the file, then choose it again
                </h3>
                <div className="overflow-x-auto rounded-lg border border-line">
                  <table className="w-full text-left text-sm" data-testid="import-issues">
                    <caption className="sr-only">Problems in the file</caption>
                    <thead className="bg-paper/60 text-xs uppercase tracking-wide text-muted">
                      <tr>
                        <th scope="col" className="px-3 py-2">
                          Line
                        </th>
                        <th scope="col" className="px-3 py-2">
                          Column
                        </th>
                        <th scope="col" className="px-3 py-2">
                          Problem
                        </th>
                      </tr>
                    </thead>
                    <tbody className="divide-y divide-line">
                      {plan.issues.map((issue, index) => (
                        <tr key={index}>
                          <td className="px-3 py-2 tabular-nums">{issue.line ?? "—"}</td>
                          <td className="px-3 py-2 font-mono text-xs">{issue.column ?? "—"}</td>
                          <td className="px-3 py-2">{issue.message}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
                {plan.issueCount > plan.issues.length && (
                  <p className="text-xs text-muted">
                    Showing the first {plan.issues.length} of {plan.issueCount} problems.
                  </p>
                )}
              </section>
            )}

            {plan.warnings.length > 0 && (
              <ul className="space-y-1 rounded-lg border border-warn-600/30 bg-warn-50 px-4 py-3 text-sm text-warn-700">
                {plan.warnings.map((w, index) => (
                  <li key={index}>
                    {w.line !== null && <span className="font-medium">Line {w.line}: </span>}
                    {w.message}
                  </li>
                ))}
              </ul>
            )}

            {plan.create.length > 0 && (
              <section>
                <h3 className="text-sm font-semibold text-ink">New set types</h3>
                <EntryList entries={plan.create} />
              </section>
            )}
            {plan.update.length > 0 && (
              <section>
                <h3 className="text-sm font-semibold text-ink">Changed set types</h3>
                <EntryList entries={plan.update} showChanges />
              </section>
            )}
            {plan.unchanged.length > 0 && (
              <details>
                <summary className="cursor-pointer text-sm font-semibold text-ink">Unchanged set types ({plan.unchanged.length})</summary>
                <EntryList entries={plan.unchanged} />
              </details>
            )}

            <div className="flex flex-wrap items-center gap-3 border-t border-line pt-4">
              <Button disabled={blocked || busy !== null} onClick={commit}>
                {busy === "importing" ? "Importing…" : `Import ${writes} set type${writes === 1 ? "" : "s"}`}
              </Button>
              <span className="text-sm text-muted">
                {plan.issueCount > 0
                  ? "Nothing can be imported while the file has problems."
                  : writes === 0
                    ? "The catalogue already matches this file."
                    : "All of it is written at once, or nothing."}
              </span>
            </div>
          </CardBody>
        </Card>
      )}
    </div>
  );
}
