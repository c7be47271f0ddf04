// The messages a password form's server action answered with, as one alert list.
export function FormErrors({ errors, testId }: { errors: string[]; testId: string }) {
  if (errors.length === 0) return null;
  return (
    <ul role="alert" data-testid={testId} className="list-disc rounded-cell bg-fault-100 px-6 py-2 text-sm text-fault-700">
      {errors.map((x) => (
        <li key={x}>{x}</li>
      ))}
    </ul>
  );
}
