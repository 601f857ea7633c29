import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { formatCount } from "../../../lib/format";
import type { GraphProblem } from "../api/get-graph";

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
                <span className="font-medium">{problem.detail || problem.reason}</span>
                <span className="num block text-xs text-ink-muted">{problem.reason}</span>
              </TD>
              <TD>
                <code className="num block max-w-xl truncate rounded-sm bg-paper-sunken px-1.5 py-0.5 text-[0.8125rem]" title={problem.text}>
                  {problem.text === "" ? <span className="text-ink-muted italic">(empty)</span> : problem.text}
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
