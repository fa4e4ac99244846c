export { PROTOCOL_CAUTIONS, protocolNote } from './cautions.js';
export { DEMO_DEVICES, DEMO_RIDERS, type DemoDevice, type DemoDeviceKey, type DemoRider } from './lab.js';
export { DEMO_SCENARIOS, listDemoScenarios, type DemoFileSpec, type DemoScenario, type DemoScenarioKey, type DemoTruth } from './scenarios.js';
export { encodeDemoRecording, generateDemoFiles, generateDemoRecordings, type DemoFile, type DemoRecordings } from './demo-files.js';
export { buildDemoNotebook, type DemoUploads } from './demo-notebooks.js';
export { DEMO_PUBLISHED_NOTEBOOK, DEMO_SAMPLE_FILES, sampleUploadIds, type DemoSampleFile } from './sample-files.js';
export { instantiateTemplate, listTemplates, type InstantiateOptions, type NotebookTemplate, type TemplateKey } from './templates.js';
