"use client";

import { useEffect, useState, useTransition, type FormHTMLAttributes } from "react";

type Props = Omit<FormHTMLAttributes<HTMLFormElement>, "action" | "onSubmit"> & {
  /** the dispatch function from useActionState */
  action: (form: FormData) => void;
};

/**
 * A form that submits to a server action WITHOUT React's automatic form reset.
 *
 * Passing a function to <form action> makes React 19 reset the form after the action returns, even
 * when it returns validation errors: uncontrolled fields go back to their defaults and a controlled
 * <select> shows its first option while its state still holds the user's choice, so the next submit
 * posts a value the user never chose (issue 9: a "hold" became a stored "accept"). Dispatching the
 * action from onSubmit inside a transition keeps every field exactly as the user left it; pending
 * state, redirects and returned errors work as with <form action>.
 * Until the page is hydrated the fields are disabled (a fieldset that takes no space), so a submit
 * cannot fall back to the browser's plain GET of the form, which would put the values in the URL.
 */
export function ActionForm({ action, children, ...form }: Props) {
  const [, startTransition] = useTransition();
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  return (
    <form
      {...form}
      onSubmit={(e) => {
        e.preventDefault();
        const submitter = (e.nativeEvent as SubmitEvent).submitter;
        const data = new FormData(e.currentTarget, submitter ?? undefined);
        startTransition(() => action(data));
      }}
    >
      <fieldset disabled={!hydrated} style={{ display: "contents" }}>
        {children}
      </fieldset>
    </form>
  );
}
