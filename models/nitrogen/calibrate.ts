/** Calibration's public entry (the web app, the bench and the tests import it here); the code is in ./calibration/. */
export * from "./calibration";
