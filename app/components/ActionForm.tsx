"use client";

import { useTransition, type FormHTMLAttributes } from "react";

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
 */
export function ActionForm({ action, children, ...form }: Props) {
  const [, startTransition] = useTransition();
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
      {children}
    </form>
  );
}
