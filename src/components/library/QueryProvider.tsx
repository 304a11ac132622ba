/** Gives an island its own TanStack Query client (islands hydrate separately, so each needs one). */
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useState, type ComponentType, type ReactNode } from "react";
import { ApiClientError } from "../../lib/client/api";

export function QueryProvider({ children }: { children: ReactNode }) {
  const [client] = useState(
    () =>
      new QueryClient({
        defaultOptions: {
          queries: {
            staleTime: 15_000,
            refetchOnWindowFocus: false,
            // 4xx answers are final: retrying cannot change them.
            retry: (count, error) => !(error instanceof ApiClientError && error.status >= 400 && error.status < 500) && count < 2,
          },
        },
      }),
  );
  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}

/** Wraps a component so it can be used directly as an island. */
export function withQuery<P extends object>(Component: ComponentType<P>) {
  const Wrapped = (props: P) => (
    <QueryProvider>
      <Component {...props} />
    </QueryProvider>
  );
  Wrapped.displayName = `withQuery(${Component.displayName ?? Component.name})`;
  return Wrapped;
}
