import type { QueryClient } from "@tanstack/react-query";
import { createBrowserRouter, Outlet, type RouteObject } from "react-router";
import { AcceptInvitationRoute, acceptInvitationLoader } from "./routes/accept-invitation";
import { HomeRoute, homeLoader } from "./routes/app/home";
import { AppLayout, appLayoutLoader } from "./routes/app/layout";
import { MembersRoute, membersLoader } from "./routes/app/members";
import { ProjectRoute, projectLoader } from "./routes/app/project";
import { ProjectsRoute, projectsLoader } from "./routes/app/projects";
import { StackEditorRoute, stackEditorLoader } from "./routes/app/stack-editor";
import { OutboxRoute, outboxLoader } from "./routes/app/outbox";
import { ReportRoute, reportLoader } from "./routes/app/report";
import { ReportsRoute, reportsLoader } from "./routes/app/reports";
import { SuppliersRoute, suppliersLoader } from "./routes/app/suppliers";
import { NotFoundRoute } from "./routes/not-found";
import { InvitationError, RootError, RouteError } from "./routes/route-error";
import { SignInRoute, signInLoader } from "./routes/sign-in";
import { ResetPasswordRoute } from "./routes/reset-password";
import { AccountRoute } from "./routes/app/account";
import { StatusRoute, statusLoader } from "./routes/app/status";
import { NavigationProgress } from "./shell/navigation-progress";
import { BootScreen } from "./shell/boot-screen";

function Root() {
  return (
    <>
      <NavigationProgress />
      <Outlet />
    </>
  );
}

export function createRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      element: <Root />,
      errorElement: <RootError />,
      hydrateFallbackElement: <BootScreen />,
      children: [
        { path: "/sign-in", loader: signInLoader(queryClient), element: <SignInRoute /> },
        { path: "/reset-password", element: <ResetPasswordRoute /> },
        {
          path: "/invite/:token",
          loader: acceptInvitationLoader(queryClient),
          element: <AcceptInvitationRoute />,
          errorElement: <InvitationError />,
        },
        {
          path: "/",
          loader: appLayoutLoader(queryClient),
          element: <AppLayout />,
          errorElement: <RootError />,
          children: [
            {
              // Pages fail inside the shell, so the navigation stays usable.
              errorElement: <RouteError />,
              children: [
                { index: true, loader: homeLoader(queryClient), element: <HomeRoute /> },
                { path: "projects", loader: projectsLoader(queryClient), element: <ProjectsRoute /> },
                { path: "projects/:id", loader: projectLoader(queryClient), element: <ProjectRoute /> },
                {
                  path: "projects/:id/studies/new",
                  lazy: () => import("./routes/app/study-new").then((m) => m.studyNewRoute(queryClient)),
                },
                { path: "projects/:id/studies/:studyId", lazy: () => import("./routes/app/study").then((m) => m.studyRoute(queryClient)) },
                { path: "projects/:id/what-if", lazy: () => import("./routes/app/what-if").then((m) => m.whatIfRoute(queryClient)) },
                { path: "projects/:id/compare", lazy: () => import("./routes/app/compare").then((m) => m.compareRoute(queryClient)) },
                {
                  path: "projects/:id/datasets/:datasetId",
                  lazy: () => import("./routes/app/dataset").then((m) => m.datasetRoute(queryClient)),
                },
                { path: "projects/:id/revisions/:revisionId", loader: stackEditorLoader(queryClient), element: <StackEditorRoute /> },
                { path: "suppliers", loader: suppliersLoader(queryClient), element: <SuppliersRoute /> },
                { path: "members", loader: membersLoader(queryClient), element: <MembersRoute /> },
                { path: "reports", loader: reportsLoader(queryClient), element: <ReportsRoute /> },
                { path: "reports/:id", loader: reportLoader(queryClient), element: <ReportRoute /> },
                { path: "outbox", loader: outboxLoader(queryClient), element: <OutboxRoute /> },
                { path: "account", element: <AccountRoute /> },
                { path: "status", loader: statusLoader(queryClient), element: <StatusRoute /> },
                { path: "*", element: <NotFoundRoute /> },
              ],
            },
          ],
        },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}
