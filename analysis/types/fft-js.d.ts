declare module 'fft-js' {
  type Phasor = [number, number];
  const fftjs: {
    fft(signal: number[]): Phasor[];
    ifft(phasors: Phasor[]): Phasor[];
    util: {
      fftMag(phasors: Phasor[]): number[];
      fftFreq(phasors: Phasor[], sampleRate: number): number[];
    };
  };
  export default fftjs;
}
