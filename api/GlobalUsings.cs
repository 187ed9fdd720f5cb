global using Microsoft.Extensions.DependencyInjection;
global using Microsoft.Extensions.Logging;
