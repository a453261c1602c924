// An API refusal shown to the person: its message, then each field's complaint as a list.
export function ProblemList({ problem, testId }: { problem: { message: string; fields?: Record<string, string[]> }; testId?: string }) {
  return (
    <div role="alert" className="text-sm text-brick" data-testid={testId}>
      <p>{problem.message}</p>
      {problem.fields && (
        <ul className="list-disc pl-5">
          {Object.values(problem.fields)
            .flat()
            .map((m, i) => (
              <li key={i}>{m}</li>
            ))}
        </ul>
      )}
    </div>
  );
}
