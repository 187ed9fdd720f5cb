global using Serimetry.Tests.Shared;
global using Xunit;
