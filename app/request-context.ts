import { createContext } from "react-router";

/** Facts about the HTTP request that only Express knows. */
export interface RequestInfo {
  clientAddress: string;
}

export const requestInfoContext = createContext<RequestInfo>({
  clientAddress: "unknown",
});
