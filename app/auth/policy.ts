/** Lifetimes of e-mailed links, shared by the server and the pages. */
export const RESET_LINK_MINUTES = 30;
export const INVITATION_DAYS = 7;
