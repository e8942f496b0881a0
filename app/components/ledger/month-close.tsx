import { useEffect, useRef, type ReactNode, type RefObject } from "react";
import { Form, useNavigation } from "react-router";
import { SectionCard } from "~/components/section-card";
import { Button, Field, Notice, SelectField } from "~/components/ui";
import type { MonthCloseResult } from "~/ledger/month-close-form";
import { SiteOptions, type SiteChoice } from "~/components/options";

type Errors = Record<string, string | undefined>;

/** One of the two forms: a month and a site to close, or to reopen. */
function MonthForm({
  verb,
  formRef,
  errors,
  sites,
  defaultMonth,
  children,
}: {
  verb: "close" | "reopen";
  formRef: RefObject<HTMLFormElement | null>;
  errors: Errors;
  sites: readonly SiteChoice[];
  defaultMonth: string;
  /** The fields after the site, and the submit button. */
  children: ReactNode;
}) {
  const title = verb === "close" ? "Close a month" : "Reopen a month";
  return (
    <Form
      method="post"
      ref={formRef}
      noValidate
      aria-label={title}
      className="flex flex-col gap-4"
    >
      <h3 className="font-semibold">{title}</h3>
      {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
      <input type="hidden" name="intent" value={verb} />
      <Field
        label={`Month to ${verb}`}
        name="month"
        type="month"
        required
        defaultValue={defaultMonth}
        error={errors.month}
      />
      <SelectField
        label={`Site to ${verb}`}
        name="siteId"
        defaultValue=""
        error={errors.siteId}
      >
        <SiteOptions sites={sites} all="Whole organisation" />
      </SelectField>
      {children}
    </Form>
  );
}

/** Closing a month locks it; reopening one (owners) needs a reason. */
export function MonthClose({
  sites,
  canReopen,
  defaultMonth,
  result,
}: {
  sites: readonly SiteChoice[];
  canReopen: boolean;
  defaultMonth: string;
  result: MonthCloseResult | undefined;
}) {
  const busy = useNavigation().state === "submitting";
  const closeForm = useRef<HTMLFormElement>(null);
  const reopenForm = useRef<HTMLFormElement>(null);
  // After a success the form starts again from its defaults.
  useEffect(() => {
    if (!result?.message) return;
    (result.intent === "reopen" ? reopenForm : closeForm).current?.reset();
  }, [result]);
  // The action treats anything but a reopen as a close.
  const errors: Errors = result?.errors ?? {};
  const reopening = result?.intent === "reopen";
  return (
    <SectionCard headingId="close-heading" title="Month close">
      <p className="mt-1 text-ink-muted">
        A closed month is locked: corrections made later are kept as adjusting
        entries, with author, reason and time.
      </p>
      {result?.message ? (
        <div className="mt-3">
          <Notice tone="success">{result.message}</Notice>
        </div>
      ) : null}
      <div className="mt-4 grid gap-6 md:grid-cols-2">
        <MonthForm
          verb="close"
          formRef={closeForm}
          errors={reopening ? {} : errors}
          sites={sites}
          defaultMonth={defaultMonth}
        >
          <div>
            <Button type="submit" disabled={busy}>
              Close month
            </Button>
          </div>
        </MonthForm>
        {canReopen ? (
          <MonthForm
            verb="reopen"
            formRef={reopenForm}
            errors={reopening ? errors : {}}
            sites={sites}
            defaultMonth={defaultMonth}
          >
            <Field
              label="Reason"
              name="reason"
              required
              maxLength={500}
              error={reopening ? errors.reason : undefined}
            />
            <div>
              <Button type="submit" variant="danger" disabled={busy}>
                Reopen
              </Button>
            </div>
          </MonthForm>
        ) : null}
      </div>
    </SectionCard>
  );
}
