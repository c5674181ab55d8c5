import type { ReactNode } from "react";
import { Caution } from "@/app/components/Caution";

/** Every design page ends with the design caution (model estimates for a stated ambient; verify with a probe test). */
export default function DesignLayout({ children }: { children: ReactNode }) {
  return (
    <>
      {children}
      <Caution variant="design" />
    </>
  );
}
