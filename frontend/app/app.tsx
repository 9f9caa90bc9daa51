import { useState } from "react";
import { RouterProvider } from "react-router/dom";
import { AppProvider, useAppQueryClient } from "./provider";
import { createAppRouter } from "./router";

export function App() {
  const queryClient = useAppQueryClient();
  const [router] = useState(() => createAppRouter(queryClient));
  return (
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
