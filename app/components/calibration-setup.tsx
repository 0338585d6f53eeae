/**
 * The calibration form: which multipliers to fit — each with what the readings can tell about
 * it before any fit (only those they can tell start ticked) — and how each species was tested
 * (a kit's colour card, even steps, or exact numbers; the default is what the values suggest).
 */
import { Form } from "react-router";
import type { CalibrationAssessment, KitView } from "~/features/calibration/calibration-json";
import { SelectField, TextField } from "~/components/ui/field";

type MultiplierRow = {
  key: string;
  label: string;
  hint: string;
  value: number;
  assessment: CalibrationAssessment["multipliers"][number] | null;
};

const REASON_TEXT = {
  noEffect: "changing it barely moves anything you measured",
  correlated: "it pulls your readings the same way as another multiplier",
  wide: "its likely range would stay wide",
  poorFit: "the model does not follow these readings",
  determined: "",
} as const;

function AssessmentNote({ a }: { a: MultiplierRow["assessment"] }) {
  if (!a) return null;
  if (a.determinable)
    return (
      <span className="block text-xs text-fern-800" data-assessment="determinable">
        Your readings can tell this one
        {a.expectedPercent !== null ? ` (to about ±${a.expectedPercent} %)` : ""}.
      </span>
    );
  return (
    <span className="block text-xs text-amber-800" data-assessment="undetermined">
      Your readings cannot tell this one: {REASON_TEXT[a.reason]}. {a.suggestion}
    </span>
  );
}

const CHOICE_LABELS = {
  exact: "Exact numbers (a meter or a lab)",
  card: "A colour card",
  steps: "Rounded to even steps",
} as const;
const SHORT_LABELS = { exact: "exact numbers", card: "a colour card", steps: "even steps" } as const;

function KitField({
  kit,
  errors,
  values,
}: {
  kit: KitView;
  errors: Record<string, string>;
  values: Record<string, string>;
}) {
  const name = `kit.${kit.species}`;
  const chosen = values[name] ?? "auto";
  return (
    <div className="grid gap-2 sm:grid-cols-2" data-kit={kit.species}>
      <SelectField
        label={`${kit.name}: how you tested`}
        name={name}
        defaultValue={chosen}
        error={errors[name]}
        hint={kit.inferred ? `Your readings’ values suggest: ${kit.text}.` : kit.text}
        options={[
          { value: "auto", label: `As the values suggest: ${SHORT_LABELS[kit.choice]}` },
          { value: "card", label: CHOICE_LABELS.card },
          { value: "steps", label: CHOICE_LABELS.steps },
          { value: "exact", label: CHOICE_LABELS.exact },
        ]}
      />
      <TextField
        label={`${kit.name}: step (when rounded to even steps)`}
        name={`step.${kit.species}`}
        inputMode="decimal"
        defaultValue={values[`step.${kit.species}`] ?? (kit.step !== null ? String(kit.step) : "")}
        error={errors[`step.${kit.species}`]}
        hint={`In ${kit.unit}, your units.`}
      />
    </div>
  );
}

export function CalibrationSetup({
  multipliers,
  hasPlants,
  chosen,
  kits,
  errors,
  values,
  inRun,
  disabled,
  journal,
  schedule,
  checkedAgainst,
  onSchedule,
}: {
  multipliers: MultiplierRow[];
  hasPlants: boolean;
  chosen: Set<string>;
  kits: KitView[];
  errors: Record<string, string>;
  values: Record<string, string>;
  inRun: number;
  disabled: boolean;
  /** The tank's journal replay, when it has entries: from which day, and the readings within it. */
  journal: { from: string; readings: number; before: number } | null;
  /** The schedule the check below ran on (and the fit's default). */
  schedule: "journal" | "periodic" | null;
  /** That schedule in words, when the readings were checked. */
  checkedAgainst: string | null;
  /** A schedule chosen: the page checks the readings again on it. */
  onSchedule: (schedule: string) => void;
}) {
  const chosenSchedule = values.schedule ?? schedule;
  const none =
    multipliers.every((m) => !m.assessment || !m.assessment.determinable) && multipliers.some((m) => m.assessment);
  return (
    <Form method="post" className="card space-y-4">
      <input type="hidden" name="intent" value="start" />
      <fieldset className="space-y-2" aria-describedby={errors.fit ? "fit-error" : undefined}>
        <legend className="text-sm font-semibold">Multipliers to fit (0.1 to 10 each)</legend>
        {none ? (
          <p className="text-sm text-amber-800">
            These readings cannot tell any multiplier on its own yet; you may still fit one, and the report will say how
            sure it is.
          </p>
        ) : null}
        {multipliers.map((m) => {
          const disabledBox = m.key === "plantUptake" && !hasPlants;
          return (
            <label key={m.key} className="flex items-start gap-2 text-sm" data-multiplier-choice={m.key}>
              <input
                type="checkbox"
                name="fit"
                value={m.key}
                defaultChecked={chosen.has(m.key) && !disabledBox}
                disabled={disabledBox}
                className="mt-1 h-4 w-4 accent-fern-700"
              />
              <span>
                <span className="font-semibold">{m.label}</span> (now ×{m.value}) — {m.hint}
                {disabledBox ? " This scenario has no plants." : ""}
                <AssessmentNote a={m.assessment} />
              </span>
            </label>
          );
        })}
        {checkedAgainst ? (
          <p className="text-xs text-stone-600">What your readings can tell, checked against {checkedAgainst}.</p>
        ) : null}
        {errors.fit ? (
          <p id="fit-error" className="text-sm font-semibold text-red-800" role="alert">
            {errors.fit}
          </p>
        ) : null}
      </fieldset>
      {journal ? (
        <fieldset className="space-y-2">
          <legend className="text-sm font-semibold">Fit against</legend>
          <label className="flex items-start gap-2 text-sm">
            <input
              type="radio"
              name="schedule"
              value="journal"
              defaultChecked={chosenSchedule !== "periodic"}
              onChange={() => onSchedule("journal")}
              className="mt-1"
            />
            <span>
              <span className="font-semibold">The journal, as it happened</span> — the water changes, cleanings and
              plants you logged since {journal.from}, instead of the scenario’s timetable ({journal.readings} reading
              {journal.readings === 1 ? "" : "s"} in that time). Usually far better posed: the readings reflect what you
              did, not what you planned.
              {journal.before > 0 ? (
                <span className="mt-1 block" data-readings-before-journal>
                  {journal.before} older reading{journal.before === 1 ? " is" : "s are"} left out: taken before the
                  journal’s first entry, with nothing logged to replay against. Log what you did before {journal.from}{" "}
                  to use {journal.before === 1 ? "it" : "them"}, or fit against the scenario’s schedule.
                </span>
              ) : null}
            </span>
          </label>
          <label className="flex items-start gap-2 text-sm">
            <input
              type="radio"
              name="schedule"
              value="periodic"
              defaultChecked={chosenSchedule === "periodic"}
              onChange={() => onSchedule("periodic")}
              className="mt-1"
            />
            <span>
              <span className="font-semibold">The scenario’s periodic schedule</span> ({inRun} reading
              {inRun === 1 ? "" : "s"} in its run)
            </span>
          </label>
          {errors.schedule ? (
            <p className="text-sm font-semibold text-red-800" role="alert">
              {errors.schedule}
            </p>
          ) : null}
          {/* With scripts, choosing re-checks at once (onSchedule); without, this asks the page again for the choice. */}
          <noscript>
            <button type="submit" formMethod="get" formNoValidate className="btn-secondary text-sm">
              Check the readings against this choice
            </button>
          </noscript>
        </fieldset>
      ) : null}
      {kits.length ? (
        <fieldset className="space-y-3">
          <legend className="text-sm font-semibold">How you tested</legend>
          <p className="text-xs text-stone-600">
            A colour card’s reading means “nearer this colour than the next”, so the fit treats it as a range, not an
            exact number.
          </p>
          {kits.map((k) => (
            <KitField key={k.species} kit={k} errors={errors} values={values} />
          ))}
        </fieldset>
      ) : null}
      <button type="submit" className="btn" disabled={disabled}>
        {journal ? "Fit" : `Fit to ${inRun} reading${inRun === 1 ? "" : "s"}`}
      </button>
      {inRun === 0 && !journal ? (
        <p className="text-sm text-stone-700">
          Add readings dated within the run first, or change the scenario’s start date.
        </p>
      ) : null}
    </Form>
  );
}
