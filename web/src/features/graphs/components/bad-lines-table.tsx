import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { formatCount } from "../../../lib/format";
import type { GraphProblem } from "../api/get-graph";

/** "wrong-column-count" → "Wrong column count". */
function reasonText(code: string): string {
  const words = code.replace(/[-_]+/g, " ").trim();
  return words ? words[0]?.toUpperCase() + words.slice(1) : code;
}

/** Tabs and a trailing space are invisible in a table cell; show them as marks. */
function visibleText(text: string) {
  return text.split("\t").flatMap((part, i) => (i === 0 ? [part] : [<span key={i} aria-label="tab" className="text-ink-muted">⇥</span>, part]));
}

export function BadLinesTable({ problems, total }: { problems: GraphProblem[]; total: number }) {
  return (
    <div className="flex flex-col gap-2">
      <Table caption="Sampled bad lines" className="-mx-4">
        <THead>
          <TR>
            <TH numeric className="w-24">Line</TH>
            <TH className="w-56">Reason</TH>
            <TH>Text</TH>
          </TR>
        </THead>
        <TBody>
          {problems.map((problem) => (
            <TR key={problem.line}>
              <TD numeric>{formatCount(problem.line)}</TD>
              <TD>
                <span className="font-medium">{reasonText(problem.reason)}</span>
                {problem.detail ? <span className="block text-xs text-ink-muted">{problem.detail}</span> : null}
              </TD>
              <TD>
                <code className="num block max-w-xl truncate rounded-sm bg-paper-sunken px-1.5 py-0.5 text-[0.8125rem] whitespace-pre" title={problem.text}>
                  {problem.text === "" ? <span className="text-ink-muted italic">(empty)</span> : visibleText(problem.text)}
                </code>
              </TD>
            </TR>
          ))}
        </TBody>
      </Table>
      {total > problems.length ? (
        <p className="text-xs text-ink-muted">
          The first {formatCount(problems.length)} of {formatCount(total)} bad lines are shown.
        </p>
      ) : null}
    </div>
  );
}
