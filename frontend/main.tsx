import { StrictMode } from "react";
import { createRoot } from "react-dom/client";
import { App } from "./app/app";
import "./styles/app.css";

const container = document.getElementById("root");
if (!container) throw new Error("index.html must contain #root");

createRoot(container).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
