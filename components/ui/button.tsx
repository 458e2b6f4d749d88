import { Slot } from "@radix-ui/react-slot";
import { type ButtonHTMLAttributes, forwardRef } from "react";
import { cn } from "@/lib/cn";

const variants = {
  primary: "bg-lagoon-700 text-white hover:bg-lagoon-800 disabled:bg-lagoon-300",
  accent: "bg-ember-600 text-white hover:bg-ember-700 disabled:bg-ember-100 disabled:text-ember-700",
  secondary: "border border-line-strong bg-surface text-ink hover:bg-paper disabled:text-muted",
  ghost: "text-ink-soft hover:bg-lagoon-50 disabled:text-muted",
  danger: "bg-danger-600 text-white hover:bg-danger-700 disabled:opacity-60",
} as const;

const sizes = {
  sm: "h-8 px-3 text-sm",
  md: "h-10 px-4 text-sm",
  lg: "h-14 px-6 text-base", // station screens: large touch targets
} as const;

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: keyof typeof variants;
  size?: keyof typeof sizes;
  asChild?: boolean;
}

export const Button = forwardRef<HTMLButtonElement, ButtonProps>(function Button(
  { className, variant = "primary", size = "md", asChild, type, ...props },
  ref,
) {
  const Component = asChild ? Slot : "button";
  return (
    <Component
      ref={ref}
      type={asChild ? undefined : (type ?? "button")}
      className={cn(
        "inline-flex items-center justify-center gap-2 rounded-lg font-medium transition-colors disabled:cursor-not-allowed",
        variants[variant],
        sizes[size],
        className,
      )}
      {...props}
    />
  );
});
